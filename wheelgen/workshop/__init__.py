"""workshop"""
