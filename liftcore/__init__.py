"""liftcore: lift, drag, thrust and power of spinning cylinders and spheres.

The computation core. Pure, vectorised numpy functions in SI units; no user-interface code.
One module per physical topic (``air``, ``potential``, ``fieldcirc``, ``wind``, ``coefficients``,
``rotor``, ``voyage``, ``ballflight``); ``studies`` wraps each page kind's inputs, run and
headline numbers so that the dashboard, the command line, scenarios and reports share one path.
"""

__version__ = "0.1.0"
