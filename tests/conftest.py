"""Test-suite settings shared by every test module."""

import os

from hypothesis import settings

# In CI (CI=true) property tests draw the same examples on every run, so a result
# never depends on luck; locally they explore new examples each time.
settings.register_profile("ci", derandomize=True, deadline=None)
if os.environ.get("CI"):
    settings.load_profile("ci")
