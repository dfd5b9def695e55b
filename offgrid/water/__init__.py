"""Solar water pumping: hydraulics, the pump on the array's I-V curve, the tank.

Engine only (no UI imports).  ``fields.WATER_FIELDS`` declares the inputs' metadata;
``design.water_design`` sizes one ``[[water]]`` supply of a project.
"""
