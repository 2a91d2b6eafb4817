"""The material library's public face: find a material by id, list them, read one file.

The work is done in four modules, each with one job:

- :mod:`cryoplan.data.material`: the :class:`Material` (c, H, S, k as functions of T);
- :mod:`cryoplan.data.material_reader`: values of a file read through
  :mod:`cryoplan.units`, each problem located by file, key and line;
- :mod:`cryoplan.data.material_file`: one file read into a Material (its heat-capacity
  and conductivity models);
- :mod:`cryoplan.data.library`: the folders searched, the index of ids and aliases, the
  lookup, and the problems found.

Examples
--------
>>> m = material("copper")
>>> m.id, "copper" in material_ids()
('copper', True)
"""

from __future__ import annotations

from ..errors import CryoplanError
from .library import (
    ENV_VAR,
    all_materials,
    bundled_folder,
    library_problems,
    material,
    material_ids,
    material_origin,
    reload,
    search_folders,
    user_folder,
)
from .material import CLASSES, RANGE_TOLERANCE, STANDARD_TEMPERATURES, Material, ReferenceSet
from .material_file import read_material_file
from .material_reader import parse_value, unit_factor

__all__ = [
    "CLASSES",
    "ENV_VAR",
    "RANGE_TOLERANCE",
    "STANDARD_TEMPERATURES",
    "CryoplanError",
    "Material",
    "ReferenceSet",
    "all_materials",
    "bundled_folder",
    "library_problems",
    "material",
    "material_ids",
    "material_origin",
    "parse_value",
    "read_material_file",
    "reload",
    "search_folders",
    "unit_factor",
    "user_folder",
]
