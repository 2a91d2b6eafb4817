"""The one unit registry of the application, and parsing of quantities written by users.

Strings such as ``"12 kg"``, ``"4.2 K"``, ``"20 degC"``, ``"3 /h"``, ``"22 kg +- 1 kg"`` or
``"18 USD/L"`` are parsed here, once, at the boundary; their dimension is checked and they
are converted to SI floats. The physics core never sees a pint Quantity.

A quantity is read by a grammar of our own, never by pint's expression parser::

    quantity   := [sign] NUMBER [units] [spread]
    spread     := ("+-" | "±" | "+/-") NUMBER [units]
    units      := "%" | product
    product    := ["/"] factor (("*" | "/" | " ") factor)*     # "1/h" and "/h" alike
    factor     := (NAME | "(" product ")") [("^" | "**") power]
    power      := [sign] INTEGER | [sign] DECIMAL | "(" [sign] INTEGER "/" INTEGER ")"

A NAME is looked up in :data:`BASE_UNITS` (exact SI factors, with SI prefixes on the
symbols of :data:`PREFIXABLE`) and only then, one name at a time, in pint's registry
(:meth:`pint.UnitRegistry.parse_unit_name`). The SI factor and the dimension of the whole
expression are computed here from those of its names. Limits keep every call short: at
most :data:`MAX_LENGTH` characters, brackets nested at most :data:`MAX_DEPTH` deep, and no
resulting power of a unit above :data:`MAX_POWER` in size. ``%`` stands alone; offset
temperatures (``degC``, ``degF``) stand alone and are converted explicitly. Anything else is
an :class:`~cryoplan.errors.InputError` that names what was found and what was expected, in
plain words ("22 C is an electric charge; for a temperature write 22 degC or 295 K").
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass
from decimal import Decimal
from fractions import Fraction
from functools import lru_cache

from .errors import InputError
from .unit_tables import (  # noqa: F401  (re-exported: units.X stays the public name)
    _BASE,
    _ENERGY,
    _HECTO,
    _LENGTH,
    _PLAIN_NAMES,
    _POWERS,
    _PRESSURE,
    _PRICE,
    _TEMPERATURE,
    _TEMPERATURE_EXAMPLES,
    _TIME,
    _VOLUME,
    _WRITE_AS,
    BASE_UNITS,
    DIMENSIONS,
    FAST_UNITS,
    MAX_DENOMINATOR,
    MAX_DEPTH,
    MAX_LENGTH,
    MAX_POWER,
    OFFSET_UNITS,
    PREFIXABLE,
    PREFIXES,
    _dim,
)


@lru_cache(maxsize=1)
def registry():
    """The application's pint UnitRegistry, built once, without pint's disk cache.

    pint's cache folder holds pickles, which run code when read (issue 14 item 6); the
    registry is built from pint's definitions each time instead (about 0.15 s on the
    development machine). Plans that use the names of :data:`BASE_UNITS` never build it.
    """
    import pint

    ureg = pint.UnitRegistry(cache_folder=None)
    ureg.define("percent_unit = 0.01 = pct")
    return ureg


def _example(dimension: str) -> str:
    return {
        "mass": "a mass such as '22 kg' or '500 g'",
        "temperature": _TEMPERATURE_EXAMPLES,
        "length": "a length such as '250 mm'",
        "area": "an area such as '20 mm^2'",
        "volume": "a volume such as '100 L'",
        "power": "a power such as '0.25 W'",
        "pressure": "a pressure such as '1 atm' or '120 kPa'",
        "time": "a time such as '3 h'",
        "rate": "a rate such as '2 /h'",
        "flow": "a flow such as '300 m^3/h'",
        "current": "a current such as '100 A'",
        "molar mass": "a molar mass such as '63.546 g/mol'",
        "magnetic field": "a magnetic field such as '0.05 T' or '40 mT'",
    }.get(dimension, f"a {dimension} with units")


# --------------------------------------------------------------------------- the grammar


@dataclass(frozen=True)
class Units:
    """A parsed unit expression: SI value = ``factor * (value + offset)``.

    ``dimension`` is a sorted tuple of (pint base dimension, power) pairs, empty for a
    plain number; ``offset`` is non-zero for degC and degF only; ``text`` is the expression
    as written.
    """

    factor: float
    dimension: tuple[tuple[str, Fraction], ...]
    offset: float = 0.0
    text: str = ""


_NONE = Units(1.0, (), 0.0, "")
_PERCENT = Units(0.01, (), 0.0, "%")

_TOKEN = re.compile(
    r"""(?P<space>\s+)
    |(?P<num>(?:[0-9]+\.?[0-9]*|\.[0-9]+)(?:[eE][-+]?[0-9]+)?)
    |(?P<name>°?[^\W\d]+)
    |(?P<op>\*\*|\+/-|\+-|[*·⋅/^()±%+-])""",
    re.VERBOSE,
)
_SPREAD_OPS = ("+-", "±", "+/-")
_NOT_FINITE = ("nan", "inf", "infinity")
_POWER_NUMBER = re.compile(r"^[0-9]{1,3}(?:\.[0-9]{1,3})?$")


@dataclass
class _Token:
    kind: str  # "num", "name", "op", "end"
    text: str
    at: int  # 1-based character position
    space_before: bool = False


class _Refused(Exception):
    """A grammar error: message and what was expected, made into an InputError above."""

    def __init__(self, message: str, expected: str | None = None) -> None:
        super().__init__(message)
        self.message = message
        self.expected = expected


def _tokens(text: str) -> list[_Token]:
    out: list[_Token] = []
    i, space = 0, False
    while i < len(text):
        m = _TOKEN.match(text, i)
        if not m:
            raise _Refused(f"an unexpected character {text[i]!r} at character {i + 1}")
        kind = m.lastgroup
        if kind == "space":
            space = True
        else:
            op = m.group()
            if op in ("·", "⋅"):
                op = "*"
            out.append(_Token(kind, op, i + 1, space))
            space = False
        i = m.end()
    out.append(_Token("end", "", len(text) + 1, space))
    return out


def _describe(token: _Token) -> str:
    if token.kind == "end":
        return "the end of the text"
    return f"{token.text!r} at character {token.at}"


class _Parser:
    """Recursive descent over the tokens of one quantity; ``parse`` returns its parts."""

    def __init__(self, text: str) -> None:
        self.text = text
        self.tokens = _tokens(text)
        self.i = 0

    @property
    def tok(self) -> _Token:
        return self.tokens[self.i]

    def take(self) -> _Token:
        t = self.tokens[self.i]
        self.i += 1
        return t

    def is_op(self, *ops: str) -> bool:
        return self.tok.kind == "op" and self.tok.text in ops

    def number(self) -> tuple[float, str]:
        sign = ""
        if self.is_op("-", "+"):
            sign = self.take().text
        t = self.tok
        if t.kind == "name" and t.text.lower() in _NOT_FINITE:
            raise _Refused(f"{t.text!r} is not a finite number")
        if t.kind != "num":
            raise _Refused(f"a number was expected, found {_describe(t)}")
        self.take()
        value = float(sign + t.text)
        if not math.isfinite(value):
            raise _Refused(f"the number {sign + t.text} is too large")
        return value, sign + t.text

    def parse(self):
        """-> (value, value text, Units or None, spread or None, spread Units or None)."""
        value, shown = self.number()
        units = self.units_or_none()
        spread = spread_units = None
        if self.is_op(*_SPREAD_OPS):
            op = self.take()
            if self.tok.kind == "end":
                raise _Refused(f"a number is missing after {op.text!r}")
            spread, _ = self.number()
            spread_units = self.units_or_none()
        if self.tok.kind != "end":
            t = self.tok
            if t.kind == "op" and t.text == ")":
                raise _Refused(f"a ')' at character {t.at} without its '('")
            if t.kind == "op" and t.text == "%":
                raise _Refused("a percent sign stands alone, as in '5 %'")
            raise _Refused(f"{_describe(t)} where the text should end")
        return value, shown, units, spread, spread_units

    def units_or_none(self) -> Units | None:
        t = self.tok
        if t.kind == "end" or self.is_op(*_SPREAD_OPS):
            return None
        start = t.at
        if self.is_op("%"):
            self.take()
            return _PERCENT
        factors = self.product(0)
        end = self.tok.at
        return _assemble(factors, self.text[start - 1 : end - 1].strip())

    def product(self, depth: int) -> dict[str, Fraction]:
        """factor (op factor)*: {unit name: power}."""
        powers: dict[str, Fraction] = {}
        divided = False
        if self.is_op("/"):
            self.take()
            self.require_factor("/")
            _merge(powers, self.factor(depth), -1)
            divided = True
        elif self.tok.kind == "num" and self.tok.text == "1" and self._next_is("/"):
            self.take()  # the 1 of "1/h"
        else:
            _merge(powers, self.factor(depth), 1)
        while True:
            t = self.tok
            if self.is_op("*", "/"):
                self.take()
                self.require_factor(t.text)
                _merge(powers, self.factor(depth), -1 if t.text == "/" else 1)
                divided = divided or t.text == "/"
            elif t.kind == "name" or self.is_op("("):
                if divided:
                    raise _Refused(
                        f"{_describe(t)} after a '/' is ambiguous",
                        "units such as 'J/(kg K)', with brackets round what divides",
                    )
                _merge(powers, self.factor(depth), 1)
            elif t.kind == "num":
                raise _Refused(
                    f"a number ({_describe(t)}) inside the units",
                    "one number, then its units, such as '2 kg' or '3 /h'",
                )
            else:
                return powers

    def _next_is(self, op: str) -> bool:
        nxt = self.tokens[self.i + 1]
        return nxt.kind == "op" and nxt.text == op

    def require_factor(self, after: str) -> None:
        t = self.tok
        if t.kind == "end":
            raise _Refused(f"a unit is missing after {after!r}")
        if t.kind == "num":
            raise _Refused(
                f"a number ({_describe(t)}) inside the units",
                "one number, then its units, such as '2 kg' or '3 /h'",
            )

    def factor(self, depth: int) -> dict[str, Fraction]:
        t = self.tok
        if t.kind == "name":
            self.take()
            powers = {t.text: Fraction(1)}
        elif self.is_op("("):
            if depth >= MAX_DEPTH:
                raise _Refused(f"brackets nested deeper than {MAX_DEPTH}")
            self.take()
            if self.is_op(")"):
                raise _Refused(f"empty brackets at character {t.at}")
            powers = self.product(depth + 1)
            if not self.is_op(")"):
                raise _Refused(f"the '(' at character {t.at} is not closed")
            self.take()
        elif self.is_op("%"):
            raise _Refused("a percent sign stands alone, as in '5 %'")
        else:
            raise _Refused(f"a unit was expected, found {_describe(t)}")
        if self.is_op("^", "**"):
            op = self.take()
            p = self.power(op.text)
            for name in powers:
                powers[name] *= p
                if abs(powers[name]) > MAX_POWER:
                    raise _Refused(f"a power of {name!r} above {MAX_POWER}")
            if self.is_op("^", "**"):
                raise _Refused(f"a power of a power at character {self.tok.at}")
        return powers

    def power(self, op: str) -> Fraction:
        bracket = self.is_op("(")
        if bracket:
            self.take()
        sign = -1 if self.is_op("-") else 1
        if self.is_op("-", "+"):
            self.take()
        t = self.tok
        if t.kind != "num":
            raise _Refused(f"a power is missing after {op!r}", "a power such as 'm^2' or 'h^-1'")
        if not _POWER_NUMBER.match(t.text):
            raise _Refused(f"the power {t.text!r} is not a small number")
        self.take()
        p = Fraction(t.text)
        if bracket and self.is_op("/"):
            self.take()
            d = self.tok
            if d.kind != "num" or not re.fullmatch(r"[0-9]{1,3}", d.text):
                raise _Refused(f"a whole number was expected, found {_describe(d)}")
            self.take()
            if int(d.text) == 0:
                raise _Refused("a power divided by zero")
            p /= int(d.text)
        if bracket:
            if not self.is_op(")"):
                raise _Refused(f"the power's '(' is not closed, found {_describe(self.tok)}")
            self.take()
        p *= sign
        if p == 0:
            raise _Refused("a power of zero")
        if abs(p) > MAX_POWER:
            raise _Refused(f"a power above {MAX_POWER}")
        if p.denominator > MAX_DENOMINATOR:
            raise _Refused(f"the power {p} is not a simple fraction such as (1/2)")
        return p


def _merge(into: dict[str, Fraction], powers: dict[str, Fraction], sign: int) -> None:
    for name, p in powers.items():
        into[name] = into.get(name, Fraction(0)) + sign * p
        if abs(into[name]) > MAX_POWER:
            raise _Refused(f"a power of {name!r} above {MAX_POWER}")


def _assemble(powers: dict[str, Fraction], text: str) -> Units:
    """The SI factor and dimension of a product of unit names with powers."""
    offset_names = [n for n in powers if n in OFFSET_UNITS or _pint_offset(n)]
    if offset_names:
        name = offset_names[0]
        if len(powers) != 1 or powers[name] != 1:
            raise _Refused(
                f"{name} cannot be multiplied, divided or raised to a power",
                f"a temperature such as '20 {name}' alone, or K in a unit such as 'W/K'",
            )
        factor, offset = OFFSET_UNITS.get(name) or _pint_offset(name)
        return Units(factor, _TEMPERATURE, offset, text)
    factor = 1.0
    dims: dict[str, Fraction] = {}
    for name, p in powers.items():
        if p == 0:
            continue
        f, d = unit_name(name)
        try:
            factor *= f ** float(p) if p.denominator != 1 else f ** int(p)
        except OverflowError:
            raise _Refused(f"the units {text!r} are too large") from None
        for base, q in d:
            dims[base] = dims.get(base, Fraction(0)) + q * p
    if not (math.isfinite(factor) and factor > 0):
        raise _Refused(f"the units {text!r} are too large or too small")
    return Units(factor, tuple(sorted((k, v) for k, v in dims.items() if v)), 0.0, text)


def _prefixed(name: str):
    for prefix, exponent in PREFIXES.items():
        if name.startswith(prefix) and name[len(prefix) :] in PREFIXABLE:
            base = name[len(prefix) :]
            factor, dims = BASE_UNITS[base]
            return float(Decimal(repr(factor)).scaleb(exponent)), dims
    if name.startswith("h") and name[1:] in _HECTO:
        factor, dims = BASE_UNITS[name[1:]]
        return float(Decimal(repr(factor)).scaleb(2)), dims
    return None


@lru_cache(maxsize=512)
def unit_name(name: str) -> tuple[float, tuple[tuple[str, Fraction], ...]]:
    """SI factor and dimension of one unit name (``"kPa"``, ``"ft"``), not an expression.

    Looked up in :data:`BASE_UNITS` with :data:`PREFIXES`, then in pint's registry by
    :meth:`pint.UnitRegistry.parse_unit_name`, which reads one name and never evaluates an
    expression.

    Raises
    ------
    InputError
        The name is not a unit known to the application.

    Examples
    --------
    >>> unit_name("kPa")[0]
    1000.0
    >>> unit_name("mK")
    (0.001, (('[temperature]', Fraction(1, 1)),))
    """
    if name in BASE_UNITS:
        return BASE_UNITS[name]
    hit = _prefixed(name)
    if hit is not None:
        return hit
    canonical = _pint_name(name)
    if canonical is None:
        raise InputError(f"unknown unit {name!r}", found=repr(name))
    ureg = registry()
    try:
        dims = ureg.get_dimensionality(canonical)
        powers = tuple(
            sorted((str(k), Fraction(v).limit_denominator(1000)) for k, v in dims.items())
        )
        if any(base not in _BASE for base, _ in powers):
            raise ValueError("a dimension outside the SI base dimensions")
        si = "*".join(f"{_BASE[b]}**{float(p)!r}" for b, p in powers) or "dimensionless"
        factor = float(ureg.Quantity(1.0, canonical).m_as(si))
    except Exception:  # pint refusing its own name (a prefixed offset unit): not a unit
        raise InputError(f"unknown unit {name!r}", found=repr(name)) from None
    if not (math.isfinite(factor) and factor > 0):
        raise InputError(f"unknown unit {name!r}", found=repr(name))
    return factor, powers


@lru_cache(maxsize=512)
def _pint_name(name: str) -> str | None:
    """pint's canonical name of one unit name, or None when pint does not know it."""
    if not re.fullmatch(r"°?[^\W\d]+", name) or len(name) > 40:
        return None
    try:
        candidates = registry().parse_unit_name(name)
    except Exception:  # pint's own lookup failing on an odd name: unknown
        return None
    if not candidates:
        return None
    prefix, unit, suffix = candidates[0]
    return prefix + unit + suffix


@lru_cache(maxsize=64)
def _pint_offset(name: str) -> tuple[float, float] | None:
    """(factor, offset) of a pint temperature unit with an offset, None otherwise."""
    if name in BASE_UNITS or name in OFFSET_UNITS or _prefixed(name) is not None:
        return None
    canonical = _pint_name(name)
    if canonical is None:
        return None
    ureg = registry()
    try:
        if dict(ureg.get_dimensionality(canonical)) != {"[temperature]": 1}:
            return None
        zero = float(ureg.Quantity(0.0, canonical).m_as("kelvin"))
        factor = float(ureg.Quantity(1.0, canonical).m_as("kelvin")) - zero
    except Exception:  # pint refusing its own name: left to unit_name to refuse
        return None
    if zero == 0.0 or not factor > 0:
        return None
    return factor, zero / factor


@lru_cache(maxsize=1)
def _plain_names() -> dict[tuple, str]:
    table = {}
    for words, si in _PLAIN_NAMES:
        table.setdefault(parse_units(si).dimension, words)
    return table


@lru_cache(maxsize=64)
def _expected_dimension(dimension: str) -> tuple[tuple[str, Fraction], ...]:
    return parse_units(DIMENSIONS[dimension][1]).dimension


def _in_words(dims: tuple[tuple[str, Fraction], ...]) -> str:
    """'an electric charge', or the SI base units of a dimension without a plain name."""
    if not dims:
        return "a plain number"
    words = _plain_names().get(dims)
    if words:
        return words
    up = [f"{_BASE[b]}^{p}" if p != 1 else _BASE[b] for b, p in dims if p > 0]
    down = [f"{_BASE[b]}^{-p}" if p != -1 else _BASE[b] for b, p in dims if p < 0]
    shown = " ".join(up) or "1"
    if down:
        shown += " / " + (down[0] if len(down) == 1 else "(" + " ".join(down) + ")")
    return f"a quantity in {shown}"


def parse_units(text: str, **where) -> Units:
    """Parse a unit expression such as ``"W/(m K)"`` or ``"m^3/h"`` into a :class:`Units`.

    The grammar of this module's docstring: unit names of :data:`BASE_UNITS` or pint's
    registry, products, quotients, brackets and small powers; ``%`` alone; offset
    temperatures alone.

    Parameters
    ----------
    text : str
        The units alone, without a number.
    **where
        ``file``, ``line`` and ``key`` for the error message.

    Returns
    -------
    Units
        SI factor, dimension, offset (degC and degF only) and the text.

    Raises
    ------
    InputError
        Anything the grammar does not read, a name that is not a unit.

    Examples
    --------
    >>> parse_units("mJ/(mol K^2)").factor
    0.001
    >>> parse_units("L/h").factor * 3600
    0.001
    """
    expected = "units such as 'kg', 'W/(m K)' or 'm^3/h'"
    if not isinstance(text, str) or len(text) > MAX_LENGTH:
        raise InputError(
            "not units" if not isinstance(text, str) else "units too long",
            expected=expected,
            found=repr(text) if isinstance(text, str) and len(text) < 80 else repr(text)[:80],
            **where,
        )
    try:
        parser = _Parser(text)
        units = parser.units_or_none()
        if parser.tok.kind != "end":
            raise _Refused(f"{_describe(parser.tok)} where the units should end")
    except _Refused as exc:
        raise InputError(
            exc.message, expected=exc.expected or expected, found=repr(text), **where
        ) from None
    except InputError as exc:  # an unknown unit name
        raise InputError(exc.message, expected=expected, found=repr(text), **where) from None
    return units or _NONE


# --------------------------------------------------------------------------- public parsers


def _found(text) -> str:
    shown = repr(text)
    return shown if len(shown) <= 80 else shown[:60] + f"... ({len(text)} characters)"


def _read(text, expected: str, where: dict):
    """Parse one quantity string: (value, value text, Units|None, spread, spread Units|None)."""
    if isinstance(text, bool) or not isinstance(text, (str, int, float)):
        raise InputError("not a quantity", expected=expected, found=_found(text), **where)
    if isinstance(text, (int, float)):
        raise InputError("a number without units", expected=expected, found=repr(text), **where)
    if len(text) > MAX_LENGTH:
        raise InputError(
            f"a quantity longer than {MAX_LENGTH} characters",
            expected=expected,
            found=_found(text),
            **where,
        )
    try:
        parser = _Parser(text)
        if parser.tok.kind == "end" or (
            parser.tok.kind not in ("num",)
            and not parser.is_op("-", "+")
            and not (parser.tok.kind == "name" and parser.tok.text.lower() in _NOT_FINITE)
        ):
            raise _Refused("not a number with units")
        return parser.parse()
    except _Refused as exc:
        raise InputError(
            exc.message, expected=exc.expected or expected, found=repr(text), **where
        ) from None
    except InputError as exc:  # an unknown unit name
        raise InputError(exc.message, expected=expected, found=repr(text), **where) from None


def _wrong_kind(text: str, shown: str, units: Units, dimension: str) -> str:
    """'22 C is an electric charge; for a temperature write 22 degC or 295 K'."""
    what = _in_words(units.dimension)
    if dimension == "temperature":
        how = f"for a temperature write {shown} degC or {float(shown) + 273.15:.0f} K"
    else:
        unit = _WRITE_AS.get(dimension, DIMENSIONS[dimension][1].replace("**", "^"))
        how = f"for {_article(dimension)} write {shown} {unit}"
    return f"wrong kind of quantity: {text.strip()} is {what}; {how}"


def _article(dimension: str) -> str:
    if dimension.startswith("per "):
        return "something " + dimension
    return ("an " if dimension[0] in "aeiou" else "a ") + dimension


def _si(value: float, units: Units) -> float:
    return units.factor * (value + units.offset) if units.offset else value * units.factor


def _checked(number: float, text, expected: str, where: dict) -> float:
    if not math.isfinite(number):
        raise InputError(
            "a value too large to compute with", expected=expected, found=repr(text), **where
        )
    return number


def _quantity(text, dimension: str, allow_spread: bool, where: dict):
    expected = _example(dimension)
    value, shown, units, spread, spread_units = _read(text, expected, where)
    if spread is not None and not allow_spread:
        raise InputError(
            "a spread (+-) is not allowed here",
            expected=f"{expected}, without a spread",
            found=repr(text),
            **where,
        )
    if units is None:
        units = spread_units  # "22 +- 1 kg": both in kg
    if units is None:
        raise InputError("the units are missing", expected=expected, found=repr(text), **where)
    fast = FAST_UNITS.get(dimension, {}).get(units.text)
    if fast is not None:  # the figures of earlier versions, to the last bit
        si = value * fast
    else:
        if units is _PERCENT or units.dimension != _expected_dimension(dimension):
            raise InputError(
                _wrong_kind(text, shown, units, dimension),
                expected=expected,
                found=repr(text),
                **where,
            )
        si = _si(value, units)
    si = _checked(si, text, expected, where)
    if spread is None:
        return si, None
    if spread < 0:
        raise InputError(
            "a negative spread", expected="a spread of zero or more", found=repr(text), **where
        )
    spread_units = spread_units or units
    if spread_units.dimension != units.dimension or (spread_units is _PERCENT) != (
        units is _PERCENT
    ):
        raise InputError(
            f"the spread's units ({spread_units.text}) do not fit the value's ({units.text})",
            expected="a spread in the value's units, such as '22 kg +- 1 kg'",
            found=repr(text),
            **where,
        )
    return si, _checked(spread * spread_units.factor, text, expected, where)


def parse_quantity(text, dimension: str, *, allow_spread: bool = False, **where) -> float:
    """Parse ``text`` (a string with units) into an SI float of the named dimension.

    Parameters
    ----------
    text : str
        For example ``"22 kg"``, ``"4.2 K"``, ``"20 degC"``, ``"300 g"``, ``"3 /h"``.
    dimension : str
        A key of :data:`DIMENSIONS`, for example ``"mass"``.
    allow_spread : bool
        With False (the default) a spread (``"22 kg +- 1 kg"``) is refused; with True it is
        read and dropped (use :func:`parse_uncertain` to keep it).
    **where
        ``file``, ``line`` and ``key`` for the error message.

    Returns
    -------
    float
        The value in the SI unit of :data:`DIMENSIONS` (K for temperatures).

    Raises
    ------
    InputError
        Not a string with a number and units, a unit the application does not know, text
        the grammar does not read, a non-finite value, or the wrong dimension; the message
        names what was expected and what was found, in plain words.

    Examples
    --------
    >>> parse_quantity("500 g", "mass")
    0.5
    >>> round(parse_quantity("20 degC", "temperature"), 2)
    293.15
    >>> parse_quantity("2 /h", "rate") * 3600
    2.0
    >>> try:
    ...     parse_quantity("22 C", "temperature")
    ... except InputError as exc:
    ...     print(exc.message)
    wrong kind of quantity: 22 C is an electric charge; for a temperature write 22 degC or 295 K
    """
    return _quantity(text, dimension, allow_spread, where)[0]


def parse_uncertain(text, dimension: str, *, positive: bool = False, **where):
    """Parse a quantity with an optional spread, ``"22 kg +- 1 kg"``, into SI floats.

    The spread after ``+-`` (or ``±``) is a standard deviation in the value's units, or in
    its own units of the same dimension; for degC and degF it is a temperature difference.
    ``"22 +- 1 kg"`` reads both numbers in kg.

    Parameters
    ----------
    text : str
        For example ``"22 kg +- 1 kg"``, ``"4.2 K ± 0.1 K"``, ``"22 kg"``.
    dimension : str
        A key of :data:`DIMENSIONS`.
    positive : bool
        The quantity must stay positive: a spread larger than the value is refused.
    **where
        ``file``, ``line`` and ``key`` for the error message.

    Returns
    -------
    (float, float or None)
        The value and its standard deviation in SI units; None where no spread is written.

    Raises
    ------
    InputError
        As :func:`parse_quantity`, and for a negative spread or one in units that do not
        fit the value's.

    Examples
    --------
    >>> parse_uncertain("22 kg +- 1 kg", "mass")
    (22.0, 1.0)
    >>> parse_uncertain("500 g ± 20 g", "mass")
    (0.5, 0.02)
    >>> parse_uncertain("4.2 K", "temperature")
    (4.2, None)
    """
    value, sigma = _quantity(text, dimension, True, where)
    if dimension == "temperature":
        _above_zero(value, text, where)
    if positive and sigma is not None and sigma > value:
        raise InputError(
            "a spread larger than the value, for a quantity that must stay positive",
            expected="a spread smaller than the value",
            found=repr(text),
            **where,
        )
    return value, sigma


def _above_zero(value: float, text, where: dict) -> None:
    if not value >= 0.0:
        raise InputError(
            "a temperature below absolute zero",
            expected="a temperature of 0 K or more",
            found=repr(text),
            **where,
        )


def parse_temperature(text, **where) -> float:
    """Parse a temperature; refuse values below absolute zero.

    >>> parse_temperature("77 K")
    77.0
    """
    value = parse_quantity(text, "temperature", **where)
    _above_zero(value, text, where)
    return value


def parse_price(text, **where) -> tuple[float, str, str]:
    """Parse a price per volume such as ``"18 USD/L"``.

    Returns
    -------
    (float, str, str)
        Price per cubic metre [currency/m^3], the three-letter currency code, and the
        volume unit as written.

    >>> p, cur, unit = parse_price("18 USD/L")
    >>> round(p), cur
    (18000, 'USD')
    """
    expected = "a price per volume such as '18 USD/L'"
    if not isinstance(text, str):
        raise InputError("not a price", expected=expected, found=_found(text), **where)
    if len(text) > MAX_LENGTH:
        raise InputError(
            f"a price longer than {MAX_LENGTH} characters",
            expected=expected,
            found=_found(text),
            **where,
        )
    match = _PRICE.match(text)
    if not match:
        raise InputError("not a price per volume", expected=expected, found=repr(text), **where)
    number, currency, unit = float(match.group(1)), match.group(2).upper(), match.group(3)
    if not math.isfinite(number):
        raise InputError("a price too large", expected=expected, found=repr(text), **where)
    if number < 0:
        raise InputError("a negative price", expected=expected, found=repr(text), **where)
    per = parse_quantity(f"1 {unit}", "volume", **where)
    return number / per, currency, unit


def _fraction(value, low: float, high: float, allow_spread: bool, where: dict):
    expected = f"a number from {low:g} to {high:g}"
    sigma = None
    if isinstance(value, str):
        if len(value) > MAX_LENGTH:
            raise InputError(
                f"a fraction longer than {MAX_LENGTH} characters",
                expected=expected,
                found=_found(value),
                **where,
            )
        try:
            number, _, units, spread, spread_units = _read(value, expected, where)
        except InputError as exc:
            why = "" if exc.message == "not a number with units" else f": {exc.message}"
            raise InputError(
                f"not a fraction{why}", expected=expected, found=repr(value), **where
            ) from None
        units = units or spread_units or _NONE
        spread_units = spread_units or units
        for u in (units, spread_units):
            if u.dimension or u.offset:
                raise InputError(
                    f"not a fraction: {u.text} has units",
                    expected=f"{expected}, or a share such as '5 %'",
                    found=repr(value),
                    **where,
                )
        if spread is not None:
            if not allow_spread:
                raise InputError(
                    "a spread (+-) is not allowed here",
                    expected=f"{expected}, without a spread",
                    found=repr(value),
                    **where,
                )
            if spread < 0:
                raise InputError(
                    "a negative spread",
                    expected="a spread of zero or more",
                    found=repr(value),
                    **where,
                )
            sigma = spread * spread_units.factor
        shown = value
        value = number * units.factor
    else:
        shown = value
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        raise InputError("not a number", expected=expected, found=_found(value), **where)
    value = float(value)
    if not (low <= value <= high):
        raise InputError("out of range", expected=expected, found=repr(shown), **where)
    return value, sigma


def parse_fraction(value, low: float = 0.0, high: float = 1.0, **where) -> float:
    """A plain number in [low, high]; ``"5 %"`` is accepted and means 0.05.

    >>> parse_fraction("5 %")
    0.05
    >>> parse_fraction(0.4)
    0.4
    """
    return _fraction(value, low, high, False, where)[0]


def parse_uncertain_fraction(value, low: float = 0.0, high: float = 1.0, **where):
    """A plain number in [low, high] with an optional spread: ``"20 % +- 5 %"``.

    The spread is a standard deviation in the value's units: ``"20 % +- 5 %"`` is five
    percentage points, ``"0.4 +- 0.1"`` one tenth.

    Returns
    -------
    (float, float or None)
        The fraction and its standard deviation; None where no spread is written.

    Examples
    --------
    >>> parse_uncertain_fraction("20 % +- 5 %")
    (0.2, 0.05)
    >>> parse_uncertain_fraction("0.4 +- 0.1")
    (0.4, 0.1)
    >>> parse_uncertain_fraction(0.4)
    (0.4, None)
    """
    return _fraction(value, low, high, True, where)
