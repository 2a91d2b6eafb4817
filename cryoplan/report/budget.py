"""Build the printed budget's blocks from ``Results.to_dict()``."""

from __future__ import annotations

from .document import (
    Bullets,
    Chart,
    Heading,
    Paragraph,
    Table,
    duration_h,
    energy,
    litres,
    money,
    sig,
)


def _sections() -> list:
    from .sections import loads_section, refrigeration_section, rooms_section

    return [loads_section, refrigeration_section, rooms_section]


def _summary(data: dict) -> list:
    from ..evaluation.summary import report_label as label

    s = data["summary"]
    rows = []
    for cry, v in s["cooldown_liquid_L"].items():
        rows.append([label("cooldown_liquid_L", cry), f"{litres(v)} L"])
    for cry, v in s["order_L"].items():
        rng = data["order"][cry]["range"]
        rows.append(
            [
                label("order_L", cry),
                f"{litres(v)} L  (low {litres(rng['low']['order_L'])},"
                f" high {litres(rng['high']['order_L'])})",
            ]
        )
    for cry, v in s.get("cost", {}).items():
        rows.append([label("cost", cry), money(v, s.get("currency", ""))])
    rows.append([label("heat_J"), energy(s.get("heat_J"))])
    rows.append(
        [
            label("minimum_work_J"),
            energy(s["minimum_work_J"]) + f" = {sig(s['minimum_work_J'] / 3.6e6)} kWh",
        ]
    )
    for cry, v in s.get("static_boiloff_L_per_day", {}).items():
        rows.append([label("static_boiloff_L_per_day", cry), f"{litres(v)} L/day"])
    for cry, v in s.get("hold_time_h", {}).items():
        rows.append([label("hold_time_h", cry), duration_h(v)])
    baths = (data.get("loads") or {}).get("baths", [])
    month: dict[str, list] = {}
    for b in baths:
        entry = month.setdefault(b["cryogen"], [0.0, None, b["currency"], b["month_days"]])
        entry[0] += b["month_order_L"]
        if b["month_cost"] is not None:
            entry[1] = (entry[1] or 0.0) + b["month_cost"]
    for cry, (order, cost, currency, days) in month.items():
        text = f"{litres(order)} L" + (f", {money(cost, currency)}" if cost is not None else "")
        rows.append([f"Running {days:g} days, {cry}", text])
    if s.get("cooldown_time_h") is not None:
        rows.append([label("cooldown_time_h"), duration_h(s["cooldown_time_h"])])
    blocks = []
    if s.get("lowest_oxygen_percent") is not None:
        rows.append([label("lowest_oxygen_percent"), f"{s['lowest_oxygen_percent']:.1f} %"])
    blocks = [Heading("Summary"), Table(["Figure", "Value"], rows, "ll", name="summary")]
    if s.get("lowest_oxygen_percent") is not None:
        from .cautions import DEFERRAL

        blocks.append(
            Paragraph(
                "The oxygen figure is a planning estimate for a well-mixed room, not a risk "
                "assessment (see Room oxygen checks and Cautions). " + DEFERRAL
            )
        )
    return blocks


def _cold_mass(data: dict) -> list:
    rows = []
    for st in data["cold_mass"]:
        for p in st["parts"]:
            rows.append(
                [
                    st["stage"],
                    f"{st['temperature_K']:g}",
                    p["name"],
                    p["material"],
                    sig(p["mass_kg"]),
                    f"{p['start_K']:g}",
                ]
            )
    return [
        Heading("Cold mass"),
        Table(
            ["Stage", "T [K]", "Part", "Material", "Mass [kg]", "Start [K]"],
            rows,
            "lrllrr",
            name="cold_mass",
        ),
    ]


def _budget(data: dict) -> list:
    b = data["budget"]
    bands = b["bands"]
    blocks: list = [
        Heading("Cooldown budget by temperature band"),
        Paragraph(
            "Heat and entropy to remove from the cold mass, and the minimum "
            "(reversible) work of removing them against the ambient."
        ),
    ]
    for label, key, fmt in (
        ("Heat to remove", "heat_J", energy),
        ("Entropy to remove [J/K]", "entropy_J_per_K", sig),
        ("Minimum work", "work_J", energy),
    ):
        rows = []
        for st in b["stages"]:
            rows.append([st["stage"]] + [fmt(v) for v in st[key]] + [fmt(sum(st[key]))])
        rows.append(["total"] + [fmt(v) for v in b["total"][key]] + [fmt(sum(b["total"][key]))])
        blocks.append(
            Table(["Stage"] + bands + ["all"], rows, "lrrrrr", title=label, name=f"budget_{key}")
        )
    total_h = sum(b["total"]["heat_J"]) or 1.0
    total_w = sum(b["total"]["work_J"]) or 1.0
    heat, work = b["total"]["heat_J"], b["total"]["work_J"]
    shares = []
    for name, h, w in zip(bands, heat, work):
        if h > 0:
            shares.append(
                f"{name}: {h / total_h * 100:.1f} % of the heat, "
                f"{w / total_w * 100:.1f} % of the work, {w / h:.2g} J of work per "
                "J of heat"
            )
    blocks.append(
        Paragraph(
            "By band: " + "; ".join(shares) + ". The colder the band, the "
            "dearer each joule (T0/T - 1 per joule at T)."
        )
    )
    return blocks


def _steps(data: dict) -> list:
    if not data["steps"]:
        return [
            Heading("Cooldown steps"),
            Paragraph("No cryogen steps: a cooler does the cooling (see Refrigeration)."),
        ]
    rows = []
    for s, r in zip(data["steps"], data["steps_range"]):
        rows.append(
            [
                str(s["step"]),
                s["cryogen"],
                f"{s['to_K']:.4g}",
                f"{s['gas_use']:g}",
                litres(r["low"]),
                litres(r["nominal"]),
                litres(r["high"]),
            ]
        )
    blocks = [
        Heading("Cooldown steps"),
        Table(
            ["Step", "Cryogen", "To [K]", "gas_use", "Low [L]", "Nominal [L]", "High [L]"],
            rows,
            "llrrrrr",
            name="steps",
        ),
        Paragraph(
            "Liquid boiled by the cold mass alone: no transfer loss, no bath fill. "
            "Low uses the highest gas_use and lightest masses, high the reverse."
        ),
    ]
    part_rows = []
    for s in data["steps"]:
        for p in s["parts"]:
            part_rows.append(
                [
                    str(s["step"]),
                    p["stage"],
                    p["part"],
                    f"{p['from_K']:.4g}",
                    f"{p['to_K']:.4g}",
                    litres(p["liquid_L"]),
                ]
            )
    if part_rows:
        blocks.append(
            Table(
                ["Step", "Stage", "Part", "From [K]", "To [K]", "Liquid [L]"],
                part_rows,
                "lllrrr",
                title="Liquid per part",
                name="steps_parts",
            )
        )
    curves = data.get("cumulative_liquid") or []
    if curves:
        blocks.append(
            Chart(
                "Cumulative liquid against temperature",
                "temperature [K]",
                "liquid boiled [L]",
                [
                    (f"step {c['step']} ({c['cryogen']})", c["temperature_K"], c["liquid_L"])
                    for c in curves
                ],
                name="cumulative_liquid",
            )
        )
    return blocks


def _order(data: dict) -> list:
    if not data["order"]:
        return []
    rows = []
    for cry, e in data["order"].items():
        dewars = ", ".join(f"{d['count']} x {d['size_L']:g} L" for d in e["dewars"]) or "-"
        rows.append(
            [
                cry,
                litres(e["cooldown_L"]),
                litres(e["bath_fill_L"]),
                litres(e["inserts_L"]),
                litres(e["transfer_loss_L"]),
                litres(e["heel_L"]),
                litres(e["order_L"]),
                money(e["cost"], e["currency"]),
            ]
        )
    blocks = [
        Heading("Order"),
        Table(
            [
                "Cryogen",
                "Cooldown",
                "Bath fill",
                "Inserts",
                "Transfer",
                "Heel",
                "Order [L]",
                "Cost",
            ],
            rows,
            "lrrrrrrr",
            name="order",
        ),
    ]
    drow = []
    for cry, e in data["order"].items():
        dewars = ", ".join(f"{d['count']} x {d['size_L']:g} L" for d in e["dewars"])
        rng = e["range"]
        drow.append(
            [
                cry,
                dewars or "(no dewar sizes given)",
                f"{litres(rng['low']['needed_L'])} / {litres(e['needed_L'])} / "
                f"{litres(rng['high']['needed_L'])}",
                f"{litres(rng['low']['order_L'])} / {litres(e['order_L'])} / "
                f"{litres(rng['high']['order_L'])}",
                "-"
                if rng["low"]["cost"] is None
                else f"{rng['low']['cost']:,.0f}-{rng['high']['cost']:,.0f} {e['currency']}",
            ]
        )
    blocks.append(
        Table(
            ["Cryogen", "Dewars", "Needed [L]", "Order [L]", "Cost"],
            drow,
            "llrrr",
            title="Dewars, low / nominal / high cases",
            name="dewars",
        )
    )
    liq = data.get("liquefaction", {})
    if liq:
        rows = [
            [
                cry,
                sig(v["ideal_kWh"]),
                sig(v["real_kWh"]),
                "-" if v["percent_of_ideal"] is None else f"{v['percent_of_ideal']:.1f} %",
            ]
            for cry, v in liq.items()
        ]
        blocks.append(
            Table(
                ["Cryogen", "Ideal [kWh]", "Real [kWh]", "Ideal/real"],
                rows,
                "lrrr",
                title="Embodied work of the liquid ordered (liquefaction from the ambient)",
                name="liquefaction",
            )
        )
    return blocks


def _closing(data: dict) -> list:
    blocks: list = []
    if data.get("notes"):
        blocks += [Heading("Notes"), Bullets(data["notes"])]
    blocks += [Heading("Assumptions"), Bullets(data["assumptions"])]
    blocks += [Heading("Cautions"), Bullets([f"{t}: {x}" for t, x in _cautions(data)])]
    blocks += [Heading("Sources"), Bullets(data["sources"], numbered=True)]
    return blocks


def _cautions(data: dict) -> list[tuple[str, str]]:
    from .cautions import CAUTIONS, PLANNING_AID_NOTICE

    picked = list(CAUTIONS)
    return picked + [("Planning aid", PLANNING_AID_NOTICE)]


def build_document(data: dict) -> list:
    """The blocks of the printed budget, in reading order."""
    blocks: list = []
    blocks += _summary(data)
    blocks += _cold_mass(data)
    blocks += _budget(data)
    blocks += _steps(data)
    blocks += _order(data)
    for builder in _sections():
        blocks += builder(data)
    blocks += _closing(data)
    return blocks
