"""The physics core: pure functions, SI floats and numpy arrays in and out.

Nothing here imports the rest of cryoplan, pint, CoolProp or any file: only the standard
library, numpy and scipy. Temperatures in kelvin, energies in joules, masses in kilograms.
"""
