"""cryoplan: cryogenics planning from material heat capacities, fluid properties and the laws
of thermodynamics.

The public API (see DEVELOPERS.md). Names are imported lazily so that ``import cryoplan``
stays fast and does not pull in CoolProp.
"""

from __future__ import annotations

__version__ = "0.1.0"

__all__ = [
    "__version__",
    "material_ids",
    "material",
    "cryogen",
    "liquid_for_cooldown",
    "minimum_work",
    "carnot_specific_power",
    "load_plan",
    "evaluate",
    "salt_ids",
    "salt",
]

_LAZY = {
    "material_ids": "data.materials",
    "material": "data.materials",
    "cryogen": "data.fluids",
    "liquid_for_cooldown": "evaluation.single",
    "minimum_work": "evaluation.single",
    "carnot_specific_power": "physics.refrigeration",
    "load_plan": "plan",
    "evaluate": "evaluation",
    "salt_ids": "data.salts",
    "salt": "data.salts",
}


def __getattr__(name):
    if name in _LAZY:
        import importlib

        module = importlib.import_module(f".{_LAZY[name]}", __name__)
        return getattr(module, name)
    raise AttributeError(f"module 'cryoplan' has no attribute {name!r}")


def __dir__():
    return sorted(__all__)
