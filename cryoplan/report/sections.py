"""Sections of the printed budget for static loads, refrigeration and rooms (formatting only)."""

from __future__ import annotations

from .document import Bullets, Chart, Heading, Paragraph, Table, duration_h, litres, money, sig


def _h(seconds) -> str:
    if seconds is None:
        return "never"
    if seconds < 120:
        return f"{seconds:.0f} s"
    if seconds < 7200:
        return f"{seconds / 60:.0f} min"
    return f"{seconds / 3600:.1f} h"


def loads_section(data: dict) -> list:
    loads = data.get("loads")
    if not loads:
        return []
    blocks: list = [Heading("Once cold: static heat loads")]
    rows = []
    for item in loads["items"]:
        detail = item.get("detail", "")
        if item.get("from"):
            detail = f"from {item['from']}; {detail}" if detail else f"from {item['from']}"
        rows.append([item["stage"], item["name"], item["kind"], sig(item["power_W"]), detail])
    blocks.append(
        Table(
            ["Stage", "Load", "Kind", "Power [W]", "Detail"],
            rows,
            "lllrl",
            title="Loads by cause",
            name="loads",
        )
    )
    srows = [
        [
            s["stage"],
            f"{s['temperature_K']:g}",
            sig(s["total_W"]),
            ", ".join(f"{k} {sig(v)}" for k, v in s["by_kind"].items()),
        ]
        for s in loads["by_stage"]
    ]
    blocks.append(
        Table(
            ["Stage", "T [K]", "Total [W]", "By kind [W]"],
            srows,
            "lrrl",
            title="Loads by stage",
            name="loads_by_stage",
        )
    )
    baths = loads.get("baths", [])
    if baths:
        brows = []
        for b in baths:
            brows.append(
                [
                    b["name"],
                    b["cryogen"],
                    litres(b["volume_L"]),
                    sig(b["load_W"]),
                    sig(b["boiloff_L_per_h"]),
                    sig(b["boiloff_L_per_day"]),
                    duration_h(b["hold_h"]),
                    duration_h(b["hold_to_refill_h"]),
                ]
            )
        blocks.append(
            Table(
                [
                    "Bath",
                    "Cryogen",
                    "Full [L]",
                    "Load [W]",
                    "L/h",
                    "L/day",
                    "Hold (empty)",
                    "To refill",
                ],
                brows,
                "llrrrrrr",
                title="Boil-off and hold time",
                name="boiloff",
            )
        )
        mrows = []
        for b in baths:
            mrows.append(
                [
                    b["name"],
                    f"{b['month_days']:g}",
                    litres(b["month_boiloff_L"]),
                    str(b["month_refills"]),
                    litres(b["month_transfer_L"]),
                    money(b["month_cost"], b["currency"]),
                ]
            )
        blocks.append(
            Table(
                ["Bath", "Days", "Boiled [L]", "Refills", "Transferred [L]", "Cost"],
                mrows,
                "lrrrrr",
                title="Running period",
                name="running_period",
            )
        )
        for b in baths:
            if b["refills"]:
                shown = b["refills"][:12]
                more = len(b["refills"]) - len(shown)
                text = ", ".join(shown) + (f" and {more} more" if more > 0 else "")
                blocks.append(Paragraph(f"Refill calendar, {b['name']}: {text}."))
    for note in loads.get("notes", []):
        blocks.append(Paragraph(note))
    return blocks


def refrigeration_section(data: dict) -> list:
    r = data.get("refrigeration")
    if not r:
        return []
    blocks: list = [Heading("Refrigeration")]
    rows = []
    for s in r["stages"]:
        rows.append(
            [
                s["stage"],
                f"{s['temperature_K']:g}",
                sig(s["load_W"]),
                sig(s["capacity_W"]),
                sig(s["carnot_W_per_W"]),
                sig(s["carnot_W"]),
                "-" if s.get("steady_K") is None else f"{s['steady_K']:.3g}",
                s.get("flag", ""),
            ]
        )
    blocks.append(
        Table(
            [
                "Stage",
                "T [K]",
                "Load [W]",
                "Capacity [W]",
                "Carnot W/W",
                "Carnot [W]",
                "Steady [K]",
                "Flag",
            ],
            rows,
            "lrrrrrrl",
            title="Stages at their targets",
            name="refrigeration",
        )
    )
    words = []
    if r.get("input_power_W") is not None and r.get("rated_carnot_W") is not None:
        words.append(
            f"Electrical input {sig(r['input_power_W'] / 1000)} kW. The cooler's "
            "capacity at the stage targets would need a Carnot (reversible) input of "
            f"{sig(r['rated_carnot_W'])} W: it runs at {sig(r['percent_of_carnot'])} % "
            f"of Carnot. The static loads alone need {sig(r['carnot_total_W'])} W of "
            "Carnot input."
        )
    elif r.get("real_input_W") is not None:
        words.append(
            f"At the plan's {sig(r['percent_of_carnot'])} % of Carnot, the static loads "
            f"need {sig(r['real_input_W'] / 1000)} kW of electrical input (Carnot "
            f"minimum {sig(r['carnot_total_W'])} W)."
        )
    if r.get("survey_percent") is not None:
        words.append(
            f"Guidance: real refrigerators of this size reach about "
            f"{sig(r['survey_percent'])} % of Carnot ({r['survey_source']})."
        )
    for w in words:
        blocks.append(Paragraph(w))
    cd = r.get("cooldown")
    if cd:
        crow = [
            [name, duration_h(None if t is None else t / 3600)]
            for name, t in cd["time_to_target_s"].items()
        ]
        blocks.append(
            Table(
                ["Stage", "Time to target"],
                crow,
                "lr",
                title="Cooldown time",
                name="cooldown_time",
            )
        )
        blocks.append(
            Paragraph(
                f"Electrical energy of the cooldown: {sig(cd['electrical_kWh'])} kWh; minimum "
                f"work of the same cooldown: {sig(cd['minimum_work_kWh'])} kWh; energy closure "
                f"of the integration: {cd['closure'] * 100:.2g} %."
            )
        )
        curve = r.get("curve")
        if curve:
            blocks.append(
                Chart(
                    "Cooldown curve",
                    "time [h]",
                    "temperature [K]",
                    [(name, curve["time_h"], ts) for name, ts in curve["stages"].items()],
                    name="cooldown_curve",
                )
            )
    for note in r.get("notes", []):
        blocks.append(Paragraph(note))
    return blocks


def rooms_section(data: dict) -> list:
    rooms = data.get("rooms")
    if not rooms:
        return []
    blocks: list = [Heading("Room oxygen checks")]
    for room in rooms:
        blocks.append(
            Heading(
                f"{room['name']}: {sig(room['volume_m3'])} m^3, "
                f"{sig(room['ventilation_m3_per_h'])} m^3/h ({sig(room['air_changes_per_h'])} air "
                f"changes/h), alarm at {room['alarm_percent']:g} %, sudden releases: "
                f"{room.get('sudden_model', 'mixed')} model",
                level=2,
            )
        )
        vrows = [
            [
                v["name"],
                v["cryogen"],
                litres(v["liquid_m3"] * 1000),
                sig(v["ratio"]),
                sig(v["gas_m3"]),
            ]
            for v in room["vessels"]
        ]
        blocks.append(
            Table(
                ["Vessel", "Cryogen", "Liquid [L]", "Expansion", "Gas [m^3]"],
                vrows,
                "llrrr",
                name=f"vessels_{_slug(room['name'])}",
            )
        )
        crows = [
            [
                c["case"],
                f"{c['lowest_percent']:.1f}",
                _h(c["time_to_alarm_s"]),
                _h(c["time_to_deficient_s"]),
                "fans off"
                if not c.get("fans_running", True)
                else sig(c["ventilation_needed_m3_per_h"])
                if c["ventilation_needed_m3_per_h"] is not None
                else "none helps",
            ]
            for c in room["cases"]
        ]
        blocks.append(
            Table(
                ["Case", "Lowest O2 [%]", "To alarm", "To 19.5 %", "Air needed [m^3/h]"],
                crows,
                "lrrrr",
                name=f"oxygen_{_slug(room['name'])}",
            )
        )
        if room["verdict"]:
            blocks.append(Bullets(room["verdict"]))
        if room.get("curves"):
            blocks.append(
                Chart(
                    f"Oxygen against time, {room['name']}",
                    "time [min]",
                    "oxygen [%]",
                    [(c["case"], c["time_min"], c["oxygen_percent"]) for c in room["curves"]],
                    name=f"oxygen_{_slug(room['name'])}_curve",
                )
            )
    effects = data.get("oxygen_effects") or []
    if effects:
        rows = [[f"{e['from_percent']:g}-{e['to_percent']:g}", e["effect"]] for e in effects]
        blocks.append(
            Table(
                ["Oxygen [%]", "Effect of breathing it"],
                rows,
                "ll",
                title="Effects of low oxygen (sources in the list below)",
                name="oxygen_effects",
            )
        )
    return blocks


def _slug(name: str) -> str:
    return "".join(ch if ch.isalnum() else "_" for ch in name.lower()).strip("_")
