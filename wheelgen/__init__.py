"""wheelgen: gear trains to checked, makeable parts.

The numeric layers (design, kinematics, teeth, layout, checks, workshop) never import
the CAD kernel; only ``wheelgen.solids`` and ``wheelgen.export`` do.
"""

__version__ = "0.1.0"
