"""The data layer: the material library (files, index, Material) and the fluid tables with
their cache. The only package that imports CoolProp."""
