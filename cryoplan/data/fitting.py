"""Fit a material's heat-capacity model to its reference points, and write the result back.

Adding a material is data entry (the file with its reference points and sources) plus
one command, ``cryoplan fit FILE --write``, which fits the model parameters here:

- ``debye-varying``: the Debye temperature at each knot (the knot temperatures are
  those in the file, or chosen among the reference temperatures), and gamma where the
  file asks for it (``fit_gamma = true``);
- ``debye``: the single Debye temperature (and gamma where asked);
- ``tabulated`` and ``mixture``: nothing to fit; the largest deviation is reported.

The fit minimises the relative deviation (c_model / c_ref - 1) in the least-squares sense
(``scipy.optimize.least_squares``), the figure the accuracy bar is stated in.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

from ..errors import InputError
from ..physics import solids
from .materials import Material, read_material_file


@dataclass
class FitResult:
    """The outcome of a fit: parameters, and the deviation at every reference point."""

    material_id: str
    model: str
    parameters: dict
    temperatures: np.ndarray
    reference: np.ndarray
    fitted: np.ndarray
    sources: list[str] = field(default_factory=list)

    @property
    def deviations(self) -> np.ndarray:
        """Relative deviation c_model / c_ref - 1 at each point, [-]."""
        return self.fitted / self.reference - 1.0

    @property
    def max_deviation(self) -> float:
        """Largest absolute relative deviation, [-]."""
        return float(np.max(np.abs(self.deviations))) if self.reference.size else 0.0

    @property
    def worst_temperature(self) -> float:
        """Temperature of the largest deviation, [K]."""
        return float(self.temperatures[np.argmax(np.abs(self.deviations))])


def _reference(material: Material) -> tuple[np.ndarray, np.ndarray, list[str]]:
    if not material.references:
        raise InputError(
            "nothing to fit: the file has no reference points",
            file=material.origin,
            key="heat_capacity.reference",
            expected="[[heat_capacity.reference]] tables with source and points",
            found="none",
        )
    t = np.concatenate([r.temperatures for r in material.references])
    c = np.concatenate([r.values for r in material.references])
    src = []
    for r in material.references:
        src.extend([r.source] * len(r.temperatures))
    order = np.argsort(t, kind="stable")
    return t[order], c[order], [src[i] for i in order]


def effective_debye_temperature(temperature, lattice_molar_heat_capacity):
    """Debye temperature that gives this lattice heat capacity per mole of atoms.

    Parameters
    ----------
    temperature : ndarray
        [K].
    lattice_molar_heat_capacity : ndarray
        Lattice heat capacity per mole of atoms, [J/(mol K)], below 3R.

    Returns
    -------
    ndarray
        theta_D [K] with ``debye_heat_capacity(T, theta_D) == C`` (bisection in log x).

    Examples
    --------
    >>> theta = effective_debye_temperature(np.array([50.0]),
    ...                                     np.array([solids.debye_heat_capacity(50.0, 343.0)]))
    >>> round(float(theta[0]), 6)
    343.0
    """
    t = np.asarray(temperature, float)
    f = np.clip(np.asarray(lattice_molar_heat_capacity, float), 1e-12, 3 * solids.R * 0.999999)
    lo = np.full_like(t, np.log(1e-4))
    hi = np.full_like(t, np.log(1e4))
    for _ in range(80):
        mid = 0.5 * (lo + hi)
        c = solids.debye_heat_capacity(1.0, np.exp(mid))  # x = theta/T with T = 1
        too_big = c > f  # heat capacity falls with x: move x up
        lo = np.where(too_big, mid, lo)
        hi = np.where(too_big, hi, mid)
    return np.exp(0.5 * (lo + hi)) * t


def _choose_knots(t: np.ndarray, count: int = 10) -> np.ndarray:
    unique = np.unique(t)
    if len(unique) <= count:
        return unique
    targets = np.geomspace(unique[0], unique[-1], count)
    picks = sorted({int(np.argmin(np.abs(np.log(unique) - np.log(x)))) for x in targets})
    return unique[picks]


def fit_material(material: Material, knot_count: int | None = None) -> FitResult:
    """Fit the model parameters of ``material`` to its reference points.

    Parameters
    ----------
    material : Material
        As read by :func:`cryoplan.library.read_material_file`.
    knot_count : int, optional
        For ``debye-varying``: choose this many knots among the reference temperatures
        instead of keeping the knot temperatures of the file.

    Returns
    -------
    FitResult
    """
    t, c_ref, src = _reference(material)
    model = material.model
    parameters: dict = {}
    if model in ("debye", "debye-varying"):
        fitted, parameters = _fit_debye(material, t, c_ref, knot_count)
    else:
        fitted = material._c_raw(t)
    return FitResult(material.id, model, parameters, t, c_ref, fitted, src)


#: Weight of the smoothness penalty on the second differences of ln theta between knots.
SMOOTHING = 0.02


def _fit_debye(material: Material, t: np.ndarray, c_ref: np.ndarray, knot_count):
    from scipy.optimize import least_squares

    params = material._params
    atoms = params["atoms"]
    terms = dict(params["terms"])
    molar_mass = material.molar_mass
    fit_gamma = bool(params.get("fit_gamma"))
    fit_dilation = bool(params.get("fit_dilation"))
    gamma0 = params["gamma_molar"]
    dilation0 = terms.pop("dilation", 0.0)
    sc = terms["superconducting"]

    def others(gamma):
        el = solids._electronic(t, gamma, sc)
        return el + solids._extra_terms(t, terms["einstein"], terms["schottky"])

    lattice = (c_ref * molar_mass - others(gamma0)) / atoms
    theta_eff = effective_debye_temperature(t, np.maximum(lattice, 1e-3 * c_ref * molar_mass))
    if material.model == "debye":
        knots_t = None
        x0 = [np.log(np.median(theta_eff))]
    else:
        if knot_count:
            knots_t = _choose_knots(t, knot_count)
        else:
            knots_t = np.asarray(params.get("knot_temperatures", _choose_knots(t)), float)
        x0 = list(np.log(np.interp(np.log(knots_t), np.log(t), theta_eff)))
    n_theta = len(x0)
    if fit_gamma:
        x0.append(np.log(max(gamma0, 1e-6)))
    if fit_dilation:
        x0.append(np.log(max(dilation0, 1e-6)))

    def unpack(x):
        thetas = np.exp(np.asarray(x[:n_theta]))
        i = n_theta
        gamma, dilation = gamma0, dilation0
        if fit_gamma:
            gamma = float(np.exp(x[i]))
            i += 1
        if fit_dilation:
            dilation = float(np.exp(x[i]))
        return thetas, gamma, dilation

    def model_c(x):
        thetas, gamma, dilation = unpack(x)
        theta = (
            thetas[0] if knots_t is None else solids.varying_debye_temperature(t, knots_t, thetas)
        )
        lat = solids.debye_heat_capacity(t, theta)
        return (atoms * (lat + dilation * lat**2 * t) + others(gamma)) / molar_mass

    def residuals(x):
        r = model_c(x) / c_ref - 1.0
        if n_theta > 2:
            r = np.concatenate([r, SMOOTHING * np.diff(np.asarray(x[:n_theta]), 2)])
        return r

    result = least_squares(residuals, x0, method="trf", xtol=1e-12, ftol=1e-12, max_nfev=5000)
    thetas, gamma, dilation = unpack(result.x)
    parameters: dict = {}
    if knots_t is None:
        parameters["debye_temperature"] = float(thetas[0])
    else:
        parameters["theta_knots"] = [
            [float(a), float(b)] for a, b in zip(knots_t, thetas, strict=True)
        ]
    if fit_gamma:
        parameters["gamma_mJ_per_mol_K2"] = gamma * 1e3
    if fit_dilation:
        parameters["dilation"] = dilation
    return model_c(result.x), parameters


def fit_file(path, knot_count: int | None = None, material: Material | None = None) -> FitResult:
    """Read a material file and fit it (a mixture needs its components: pass ``material``)."""
    m = material if material is not None else read_material_file(Path(path), allow_unfitted=True)
    if m.model == "mixture" and m._c is None:
        from .materials import material as lookup

        m = lookup(m.id)
    return fit_material(m, knot_count)


def write_fit(path, result: FitResult) -> None:
    """Write the fitted parameters into the file, keeping its comments (tomlkit)."""
    import tomlkit

    path = Path(path)
    doc = tomlkit.parse(path.read_text(encoding="utf-8"))
    hc = doc["heat_capacity"]
    if "theta_knots" in result.parameters:
        knots = tomlkit.array()
        for a, b in result.parameters["theta_knots"]:
            knots.append([round(a, 4), round(b, 3)])
        knots.multiline(True)
        hc["theta_knots"] = knots
    if "debye_temperature" in result.parameters:
        entry = hc.get("debye_temperature")
        text = f"{result.parameters['debye_temperature']:.3f} K"
        if isinstance(entry, dict):
            entry["value"] = text
        else:
            hc["debye_temperature"] = text
    if "gamma_mJ_per_mol_K2" in result.parameters:
        text = f"{result.parameters['gamma_mJ_per_mol_K2']:.5g} mJ/(mol K^2)"
        entry = hc.get("gamma")
        if isinstance(entry, dict):
            entry["value"] = text
        else:
            hc["gamma"] = {"value": text, "source": "fitted by cryoplan fit"}
    if "dilation" in result.parameters:
        hc["dilation"] = float(f"{result.parameters['dilation']:.5g}")
    summary = tomlkit.inline_table()
    summary["largest_deviation_percent"] = round(100 * result.max_deviation, 2)
    summary["at_K"] = result.worst_temperature
    summary["points"] = int(result.reference.size)
    hc["fit"] = summary
    tmp = path.with_suffix(path.suffix + ".tmp")
    tmp.write_text(tomlkit.dumps(doc), encoding="utf-8")
    tmp.replace(path)
