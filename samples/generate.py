#!/usr/bin/env python3
"""Generate Siftwave's bundled demo data: the invented Republic of Quenmara.

    python3 samples/generate.py --seed 20261201 --out samples/
    python3 samples/generate.py --seed 20261201 --check samples/

Writes, into --out:
  quenmara_regions.csv     the region register (code,name,parent,population)
  quenmara_current.csv     this week's release, long layout (date,region,cases,deaths), RFC 4180
  quenmara_previous.csv    last week's release (ends 7 days earlier; a few historic values differ)
  quenmara_cases_wide.csv  the current cases again, semicolon-delimited, dates down, DD/MM/YYYY, BOM
  manifest.json            the truth: every planted problem with its region, dates and numbers

Everything is drawn from one seeded random.Random, so a rerun with the same seed writes every file
byte for byte the same (tested on CPython 3.11; the generator uses only random.random() and
random.gammavariate(), whose algorithms have been stable across CPython 3 releases). --check
regenerates in memory and compares with the files in a folder, then re-reads those files with the
csv module and verifies every claim of the manifest against them; exit 1 on any difference.

Python 3 standard library only. This is a development tool: Siftwave never runs it.

The scenario, the country, its provinces, districts, names and codes are invented. Any
resemblance to a real place is unintended.

The model, per district:
  expected cases  mu(t) = pop/1e5 * (base + sum_k h_k * bump((t - p_k) / w_k)) * weekday(t)
                  bump(x) = sech^2(x / 2) (peak 1; the logistic curve's derivative), with a wider
                  falling than rising side;
  expected deaths d(t) = sum_k cfr_k * sum_j casecurve_k(t - j) * delay(j) * weekday_d(t),
                  delay = a gamma density (mean 13 days, sd 5) discretised by day;
  reported        negative binomial (gamma-Poisson mixture) with mean mu and size k
                  (variance mu + mu^2 / k).
Province rows (Kelvarra and Ostmere only) are the sums of their districts' reported rows.
"""

import argparse
import csv
import datetime
import hashlib
import io
import json
import math
import os
import random
import sys
import tempfile

SCHEMA_VERSION = 1
DEFAULT_SEED = 20261201

START = datetime.date(2026, 2, 23)  # a Monday
DAYS = 280  # the current release: 2026-02-23 .. 2026-11-29 (a Sunday)
PREVIOUS_DAYS = DAYS - 7  # the previous release ends a week earlier

FILE_REGIONS = "quenmara_regions.csv"
FILE_CURRENT = "quenmara_current.csv"
FILE_PREVIOUS = "quenmara_previous.csv"
FILE_WIDE = "quenmara_cases_wide.csv"
FILE_MANIFEST = "manifest.json"

# The region register. Provinces have two-letter codes; districts carry the four-digit numbers of
# the national district list, except the two city districts, which keep their historic
# two-letter codes. Nalvara City is `NA` (a missing-value token elsewhere); Skaldrin, the oldest
# numbered district, is `0412` (a leading zero).
REGIONS = [
    # code, name, parent, population
    ("KV", "Kelvarra", "", None),
    ("NA", "Nalvara, City of", "KV", 812400),
    ("1102", "Dunmarrow", "KV", 298700),
    ("1105", "Ferrisk", "KV", 341200),
    ("1109", "Cobble Reach", "KV", 187950),
    ("OS", "Ostmere", "", None),
    ("VE", "Velmora City", "OS", 534800),
    ("1203", "Harlingmoor", "OS", 402150),
    ("1207", "Saltrève", "OS", 263400),
    ("BR", "Brisande", "", None),
    ("1301", "Aubrenne", "BR", 458300),
    ("1304", "Kestrelby", "BR", 312600),
    ("1306", "Merrowdale", "BR", 276900),
    ("1310", "Tollisant", "BR", 409750),
    ("LM", "Lunmoor", "", None),
    ("0412", "Skaldrin", "LM", 231480),
    ("1405", "Orrin Fell", "LM", 178320),
    ("1408", "Wendlecombe", "LM", 264100),
]
REPORTED_PROVINCES = ("KV", "OS")  # provinces that send their own rows

# Days (0-based index from START) where the waves of the capital province peak; the others follow.
PARAMETERS = {
    "start": START.isoformat(),
    "days_current": DAYS,
    "days_previous": PREVIOUS_DAYS,
    "base_per_100k": 6.0,
    "waves": [
        # national schedule: peak day, rise width, fall width (days), height per 100k per day, cfr
        {"peak": 45, "rise": 6.0, "fall": 9.0, "height": 40.0, "cfr": 0.016},
        {"peak": 148, "rise": 7.5, "fall": 11.0, "height": 60.0, "cfr": 0.010},
        {"peak": 240, "rise": 7.0, "fall": 10.0, "height": 36.0, "cfr": 0.007},
    ],
    "base_cfr": 0.008,
    "province_lag_days": {"KV": 0, "OS": 8, "BR": 15, "LM": 24},
    "district_peak_jitter_days": 5,
    "district_height_range": [0.6, 1.45],
    "district_third_wave_skip_probability": 0.3,  # the third wave reaches only 15 % of its height there
    "death_delay_mean_days": 13.0,
    "death_delay_sd_days": 5.0,
    "death_delay_max_days": 40,
    "nb_size_cases": 50.0,
    "nb_size_deaths": 80.0,
    # weekday reporting factors Monday..Sunday (mean 1): low weekends, Monday catch-up
    "weekday_factors": [1.30, 1.16, 1.10, 1.08, 1.04, 0.72, 0.60],
    "weekday_strength_by_province": {"KV": 0.7, "OS": 1.0, "BR": 0.85, "LM": 0.6},
    "weekday_strength_deaths": 0.5,  # fraction of the cases' weekday effect seen in deaths
}

WEEKDAY_NAMES = ["Mon", "Tue", "Wed", "Thu", "Fri", "Sat", "Sun"]


def iso(day):
    return (START + datetime.timedelta(days=day)).isoformat()


def dmy(day):
    d = START + datetime.timedelta(days=day)
    return "%02d/%02d/%04d" % (d.day, d.month, d.year)


def weekday(day):
    return (START + datetime.timedelta(days=day)).weekday()  # 0 = Monday


# ---------------------------------------------------------------------------------------------
# Random draws (standard library only)


def poisson(rng, lam):
    """A Poisson draw. Inversion for lam < 10; for larger lam the PTRS transformed rejection
    method (W. Hoermann, 'The transformed rejection method for generating Poisson random
    variables', Insurance: Mathematics and Economics 12 (1993) 39-45)."""
    if lam <= 0.0:
        return 0
    if lam < 10.0:
        u = rng.random()
        k = 0
        p = math.exp(-lam)
        cumulative = p
        while u > cumulative and k < 1000:
            k += 1
            p *= lam / k
            cumulative += p
        return k
    slam = math.sqrt(lam)
    loglam = math.log(lam)
    b = 0.931 + 2.53 * slam
    a = -0.059 + 0.02483 * b
    invalpha = 1.1239 + 1.1328 / (b - 3.4)
    vr = 0.9277 - 3.6224 / (b - 2.0)
    while True:
        u = rng.random() - 0.5
        v = rng.random()
        us = 0.5 - abs(u)
        k = int(math.floor((2.0 * a / us + b) * u + lam + 0.43))
        if us >= 0.07 and v <= vr:
            return k
        if k < 0 or (us < 0.013 and v > us):
            continue
        if (math.log(v) + math.log(invalpha) - math.log(a / (us * us) + b)) <= (
            -lam + k * loglam - math.lgamma(k + 1)
        ):
            return k


def negative_binomial(rng, mean, size):
    """Gamma-Poisson mixture: mean `mean`, variance mean + mean^2 / size."""
    if mean <= 0.0:
        return 0
    return poisson(rng, rng.gammavariate(size, mean / size))


# ---------------------------------------------------------------------------------------------
# The epidemic


def bump(t, peak, rise, fall):
    width = rise if t < peak else fall
    x = (t - peak) / width
    if abs(x) > 60.0:
        return 0.0
    c = math.cosh(x / 2.0)
    return 1.0 / (c * c)


def death_delay_pmf():
    mean = PARAMETERS["death_delay_mean_days"]
    sd = PARAMETERS["death_delay_sd_days"]
    shape = (mean / sd) ** 2
    scale = sd * sd / mean
    weights = []
    for j in range(PARAMETERS["death_delay_max_days"] + 1):
        x = j + 0.5
        weights.append(
            math.exp((shape - 1.0) * math.log(x) - x / scale - math.lgamma(shape) - shape * math.log(scale))
        )
    total = sum(weights)
    return [w / total for w in weights]


def draw_district_waves(rng, province):
    lag = PARAMETERS["province_lag_days"][province]
    jitter = PARAMETERS["district_peak_jitter_days"]
    lo, hi = PARAMETERS["district_height_range"]
    waves = []
    for index, wave in enumerate(PARAMETERS["waves"]):
        height = wave["height"] * (lo + (hi - lo) * rng.random())
        if index == 2 and rng.random() < PARAMETERS["district_third_wave_skip_probability"]:
            height *= 0.15
        waves.append(
            {
                "peak": round(wave["peak"] + lag + (2.0 * rng.random() - 1.0) * jitter, 2),
                "rise": round(wave["rise"] * (0.85 + 0.3 * rng.random()), 3),
                "fall": round(wave["fall"] * (0.85 + 0.3 * rng.random()), 3),
                "height_per_100k": round(height, 3),
                "cfr": wave["cfr"],
            }
        )
    return waves


def expected_series(population, waves, province):
    """Expected daily cases and deaths (before the weekday effect) and the weekday factors."""
    scale = population / 1e5
    base = PARAMETERS["base_per_100k"]
    delay = death_delay_pmf()
    horizon = len(delay) - 1
    # Case curves from `horizon` days before the start so early deaths have their causes.
    components = []
    for w in waves:
        components.append(
            [scale * w["height_per_100k"] * bump(t, w["peak"], w["rise"], w["fall"])
             for t in range(-horizon, DAYS)]
        )
    cases = []
    deaths = []
    for t in range(DAYS):
        c = scale * base + sum(comp[t + horizon] for comp in components)
        cases.append(c)
        d = scale * base * PARAMETERS["base_cfr"]
        for w, comp in zip(waves, components):
            d += w["cfr"] * sum(comp[t + horizon - j] * delay[j] for j in range(horizon + 1))
        deaths.append(d)
    strength = PARAMETERS["weekday_strength_by_province"][province]
    factors_cases = [1.0 + strength * (f - 1.0) for f in PARAMETERS["weekday_factors"]]
    sd = strength * PARAMETERS["weekday_strength_deaths"]
    factors_deaths = [1.0 + sd * (f - 1.0) for f in PARAMETERS["weekday_factors"]]
    return cases, deaths, factors_cases, factors_deaths


# ---------------------------------------------------------------------------------------------
# Building the releases


class Scenario:
    def __init__(self, seed):
        self.seed = seed
        self.rng = random.Random(seed)
        self.districts = [r for r in REGIONS if r[2]]
        self.waves = {}
        self.expected = {}  # code -> (cases, deaths) expected incl. weekday effect
        self.true = {}  # code -> {"cases": [...], "deaths": [...]} as drawn, before planting
        self.reported = {}  # code -> {"cases": [...], "deaths": [...]}; None = no row that day
        self.factors = {}
        self.factors_deaths = {}
        self.problems = []
        self.previous_overrides = {}  # (code, measure, day) -> value in the previous release
        self.code_on_day = {}  # (code, day) -> code written in the file
        self.extra_rows = []  # (code, day) rows repeated at the end of the current file

    # -- clean data --------------------------------------------------------------------------
    def draw(self):
        for code, _name, parent, population in self.districts:
            self.waves[code] = draw_district_waves(self.rng, parent)
        for code, _name, parent, population in self.districts:
            cases_mu, deaths_mu, fc, fd = expected_series(population, self.waves[code], parent)
            cases_mu = [m * fc[weekday(t)] for t, m in enumerate(cases_mu)]
            deaths_mu = [m * fd[weekday(t)] for t, m in enumerate(deaths_mu)]
            self.expected[code] = (cases_mu, deaths_mu)
            self.factors[code] = fc
            self.factors_deaths[code] = fd
            cases = [negative_binomial(self.rng, m, PARAMETERS["nb_size_cases"]) for m in cases_mu]
            deaths = [negative_binomial(self.rng, m, PARAMETERS["nb_size_deaths"]) for m in deaths_mu]
            self.true[code] = {"cases": cases, "deaths": deaths}
            self.reported[code] = {"cases": list(cases), "deaths": list(deaths)}

    def add(self, kind, region, measure, first, last, expect_found, description, **numbers):
        entry = {
            "id": "P%02d" % (len(self.problems) + 1),
            "kind": kind,
            "file": FILE_CURRENT,
            "region": region,
            "measure": measure,
            "first": None if first is None else iso(first),
            "last": None if last is None else iso(last),
            "expect_found": expect_found,
            "description": description,
        }
        entry.update(numbers)
        self.problems.append(entry)

    # -- planted problems --------------------------------------------------------------------
    def rc(self, code):
        """The reported cases of a district (planting edits this list)."""
        return self.reported[code]["cases"]

    def tc(self, code):
        """The true cases of a district (as drawn, before planting)."""
        return self.true[code]["cases"]

    def plant(self):
        """Plants every problem, in the order of the manifest."""
        self.plant_code_collisions()
        self.plant_stale_values()
        self.plant_duplicate_row()
        self.plant_backlog_dump()
        self.plant_reporting_gap()
        self.plant_negative_correction()
        self.plant_missing_dates()
        self.plant_code_variant()
        self.plant_revisions()
        self.build_province_rows()
        self.describe_weekday_effect()

    def plant_code_collisions(self):
        # Code collisions: correct in Siftwave, lost by tools that coerce codes.
        self.add("code_collision", "NA", None, None, None, True,
                 "District code NA (Nalvara City) is a missing-value token in many tools.",
                 reason="missing-value token")
        self.add("code_collision", "0412", None, None, None, True,
                 "District code 0412 (Skaldrin) loses its leading zero in a spreadsheet.",
                 reason="leading zero")

    def plant_stale_values(self):
        # Stale values: Ferrisk's cases copied forward from day 127 (on the default seed) for six days.
        code, src, n = "1105", 127, 6
        # Start where the neighbours differ from the copied value, so the run is exactly n + 1 days.
        cases = self.rc(code)
        while cases[src - 1] == cases[src] or cases[src + n + 1] == cases[src]:
            src += 1
        value = self.rc(code)[src]
        true_values = []
        for d in range(src + 1, src + 1 + n):
            true_values.append({"date": iso(d), "true": self.tc(code)[d]})
            self.rc(code)[d] = value
        self.add("stale_values", code, "cases", src, src + n, True,
                 "Cases copied forward: the value of %s repeated on the next %d days." % (iso(src), n),
                 value=value, copied_from=iso(src), run_days=n + 1, true_values=true_values)

    def plant_duplicate_row(self):
        # Duplicate row: one Saltrève row sent twice (appended at the end of the file).
        code, d = "1207", 96
        self.extra_rows.append((code, d))
        for measure in ("cases", "deaths"):
            self.add("duplicate_row", code, measure, d, d, True,
                     "The row for %s on %s appears twice with the same values." % (code, iso(d)),
                     value=self.reported[code][measure][d], values_agree=True, lines=None)

    def plant_backlog_dump(self):
        # Backlog dump: Aubrenne withheld 45 % of its cases for three weeks, then sent them at once.
        code, dump, window, share = "1301", 182, 21, 0.45
        withheld_days = []
        excess = 0
        for d in range(dump - window, dump):
            held = int(round(self.tc(code)[d] * share))
            self.rc(code)[d] = self.tc(code)[d] - held
            excess += held
            withheld_days.append({"date": iso(d), "true": self.tc(code)[d], "reported": self.rc(code)[d]})
        self.rc(code)[dump] = self.tc(code)[dump] + excess
        self.add("backlog_dump", code, "cases", dump, dump, True,
                 "A backlog: %d%% of three weeks' cases were held back and reported on %s." %
                 (round(share * 100), iso(dump)),
                 reported=self.rc(code)[dump], true_value=self.tc(code)[dump], excess=excess,
                 window_first=iso(dump - window), window_last=iso(dump - 1), withheld_share=share,
                 window=withheld_days)

    def plant_reporting_gap(self):
        # Reporting gap with catch-up: Kestrelby sent zeros Wednesday..Sunday, then everything Monday.
        code = "1304"
        gap_first = next(d for d in range(56, 80) if weekday(d) == 2)
        gap_last = gap_first + 4
        catch = gap_last + 1
        for measure in ("cases", "deaths"):
            series = self.reported[code][measure]
            truth = self.true[code][measure]
            held = sum(truth[gap_first:catch])
            expected_sum = sum(self.expected[code][0 if measure == "cases" else 1][gap_first:catch])
            for d in range(gap_first, catch):
                series[d] = 0
            series[catch] = truth[catch] + held
            # A run of zeros is distinguishable from chance when its expected total is large:
            # P(all zero) <= exp(-expected total) under Poisson (common practice, no source).
            gap_visible = expected_sum >= 8.0
            self.add("reporting_gap", code, measure, gap_first, gap_last, gap_visible,
                     "Zeros sent for five days while the district's system was down.",
                     true_values=[truth[d] for d in range(gap_first, catch)],
                     expected_total=round(expected_sum, 2))
            self.add("backlog_dump", code, measure, catch, catch, gap_visible and held >= 30,
                     "The catch-up after the reporting gap carries the five missing days.",
                     reported=series[catch], true_value=truth[catch], excess=held,
                     window_first=iso(gap_first), window_last=iso(gap_last), after_gap=True)

    def plant_negative_correction(self):
        # Negative correction: Merrowdale removed cases entered twice over the ten days before.
        code, neg = "1306", 108
        correction = self.tc(code)[neg] + 33
        over_days = list(range(neg - 10, neg))
        shares = [correction // len(over_days)] * len(over_days)
        for i in range(correction - sum(shares)):
            shares[i] += 1
        over = []
        for d, s in zip(over_days, shares):
            self.rc(code)[d] = self.tc(code)[d] + s
            over.append({"date": iso(d), "true": self.tc(code)[d], "reported": self.rc(code)[d]})
        self.rc(code)[neg] = self.tc(code)[neg] - correction
        self.add("negative_count", code, "cases", neg, neg, True,
                 "A negative day: %d cases entered twice earlier were removed on %s."
                 % (correction, iso(neg)),
                 reported=self.rc(code)[neg], true_value=self.tc(code)[neg], correction=correction,
                 over_reported_first=iso(over_days[0]), over_reported_last=iso(over_days[-1]),
                 over_reported=over)

    def plant_missing_dates(self):
        # Missing dates: Tollisant sent no rows on two stretches. No row means neither measure,
        # so each run is one problem with measure null (as the scan reports a run missing in
        # every measure).
        code = "1310"
        for first, last in ((140, 143), (221, 222)):
            self.add("missing_dates", code, None, first, last, True,
                     "No rows for %s from %s to %s." % (code, iso(first), iso(last)),
                     measures=["cases", "deaths"], days=last - first + 1,
                     true_values={m: [self.true[code][m][d] for d in range(first, last + 1)]
                                  for m in ("cases", "deaths")})
            for d in range(first, last + 1):
                self.reported[code]["cases"][d] = None
                self.reported[code]["deaths"][d] = None

    def plant_code_variant(self):
        # Code variant: this week's rows for Skaldrin came from a system that drops leading zeros.
        code, variant = "0412", "412"
        new_days = range(PREVIOUS_DAYS, DAYS)
        for d in new_days:
            self.code_on_day[(code, d)] = variant
        self.add("code_variant", variant, None, None, None, True,
                 "Rows for Skaldrin (0412) written as 412 in the week new to this release.",
                 canonical=code, codes=[code, variant], rows=len(new_days),
                 rows_first=iso(new_days[0]), rows_last=iso(new_days[-1]))
        self.add("unknown_code", variant, None, None, None, True,
                 "412 is not in the region register (it is the variant of 0412).",
                 canonical=code)
        self.add("revision", variant, None, None, None, True,
                 "The code 412 appeared since the previous release (it is the variant of 0412).",
                 previous_file=FILE_PREVIOUS, change="region_appeared", canonical=code)

    def plant_revisions(self):
        # Revisions: late reports raised Orrin Fell's cases on six days; Wendlecombe's deaths were
        # reclassified on three days. The previous release holds the old values.
        code = "1405"
        cells = []
        for d, late in zip(range(255, 261), (9, 6, 4, 11, 3, 5)):
            old = self.rc(code)[d] - late
            if old < 0:
                old = 0
            self.previous_overrides[(code, "cases", d)] = old
            cells.append({"date": iso(d), "old": old, "new": self.rc(code)[d]})
        self.add("revision", code, "cases", 255, 260, True,
                 "Late reports raised six days of cases since the previous release.",
                 previous_file=FILE_PREVIOUS, change="values_changed", cells=cells)
        code = "1408"
        cells = []
        candidates = [d for d in range(226, 252) if self.reported[code]["deaths"][d] >= 1]
        if len(candidates) < 3:
            raise SystemExit("the deaths revision needs three days with deaths; change the seed")
        revised_days = (candidates[0], candidates[len(candidates) // 2], candidates[-1])
        for d, delta in zip(revised_days, (1, 1, -1)):
            new = self.reported[code]["deaths"][d]
            old = new - delta
            self.previous_overrides[(code, "deaths", d)] = old
            cells.append({"date": iso(d), "old": old, "new": new})
        self.add("revision", code, "deaths", revised_days[0], revised_days[-1], True,
                 "Deaths reclassified on three days since the previous release.",
                 previous_file=FILE_PREVIOUS, change="values_changed", cells=cells)

    def build_province_rows(self):
        # Province rows: sums of the districts' reported rows, except a hierarchy mismatch in
        # Kelvarra, whose province cases for five days were compiled before Cobble Reach reported.
        for prov in REPORTED_PROVINCES:
            children = [c for c, _n, p, _pop in self.districts if p == prov]
            self.reported[prov] = {}
            for measure in ("cases", "deaths"):
                self.reported[prov][measure] = [
                    sum(self.reported[c][measure][d] for c in children) for d in range(DAYS)
                ]
        prov, left_out, first, last = "KV", "1109", 200, 204
        children = [c for c, _n, p, _pop in self.districts if p == prov]
        days = []
        for d in range(first, last + 1):
            children_sum = self.reported[prov]["cases"][d]
            self.reported[prov]["cases"][d] = children_sum - self.rc(left_out)[d]
            days.append({"date": iso(d), "parent_reported": self.reported[prov]["cases"][d],
                         "children_sum": children_sum,
                         "difference": self.reported[prov]["cases"][d] - children_sum})
        self.add("hierarchy_mismatch", prov, "cases", first, last, True,
                 "Kelvarra's province cases on five days leave out Cobble Reach (1109).",
                 children=children, days=days)

    def describe_weekday_effect(self):
        # Weekday effect: every series carries it, the districts at their province's strength
        # (the province rows through their sums). A drop-wide problem, one per measure, as the
        # scan pools all regions; the pooled factors are the ratio of expected counts with and
        # without the effect, per weekday, over every district and day.
        regions = []
        for code, _name, parent, _pop in self.districts:
            strength = PARAMETERS["weekday_strength_by_province"][parent]
            regions.append({"region": code, "strength": strength,
                            "factors": {WEEKDAY_NAMES[i]: round(self.factors[code][i], 4) for i in range(7)}})
        for index, measure in enumerate(("cases", "deaths")):
            with_effect = [0.0] * 7
            without = [0.0] * 7
            for code in self.expected:
                factors = self.factors[code] if measure == "cases" else self.factors_deaths[code]
                for t, mu in enumerate(self.expected[code][index]):
                    with_effect[weekday(t)] += mu
                    without[weekday(t)] += mu / factors[weekday(t)]
            pooled = [a / b for a, b in zip(with_effect, without)]
            mean = sum(pooled) / 7.0
            pooled = [f / mean for f in pooled]
            if measure == "cases":
                self.add("weekday_effect", None, measure, 0, DAYS - 1, True,
                         "Reporting follows the week: low weekends, a Monday catch-up.",
                         pooled_factors={WEEKDAY_NAMES[i]: round(pooled[i], 4) for i in range(7)},
                         regions=regions)
            else:
                self.add("weekday_effect", None, measure, 0, DAYS - 1, False,
                         "Deaths carry the weekday effect at half the cases' strength; weak at these "
                         "counts, so a scan may or may not report it.",
                         pooled_factors={WEEKDAY_NAMES[i]: round(pooled[i], 4) for i in range(7)},
                         strength_relative_to_cases=PARAMETERS["weekday_strength_deaths"])

    # -- files -------------------------------------------------------------------------------
    def row_order(self):
        """Codes in file order: province row first, then its districts (register order)."""
        order = []
        for code, _name, parent, _pop in REGIONS:
            if parent == "" and code not in REPORTED_PROVINCES:
                continue
            order.append(code)
        return order

    def long_rows(self, days, previous):
        rows = []  # (date, code_written, cases, deaths, canonical code, day)
        for d in range(days):
            for code in self.row_order():
                cases = self.reported[code]["cases"][d]
                deaths = self.reported[code]["deaths"][d]
                if cases is None:
                    continue
                if previous:
                    cases = self.previous_overrides.get((code, "cases", d), cases)
                    deaths = self.previous_overrides.get((code, "deaths", d), deaths)
                written = self.code_on_day.get((code, d), code)
                rows.append((iso(d), written, cases, deaths, code, d))
        for code, d in self.extra_rows:
            if d < days:
                row = self.reported[code]
                rows.append((iso(d), code, row["cases"][d], row["deaths"][d], code, d))
        return rows

    def render_long(self, rows):
        out = io.StringIO(newline="")
        w = csv.writer(out, lineterminator="\r\n")  # RFC 4180 section 2.1: CRLF line breaks
        w.writerow(["date", "region", "cases", "deaths"])
        for r in rows:
            w.writerow(r[:4])
        return out.getvalue().encode("utf-8")

    def render_register(self):
        out = io.StringIO(newline="")
        w = csv.writer(out, lineterminator="\r\n")
        w.writerow(["code", "name", "parent", "population"])
        for code, name, parent, pop in REGIONS:
            if pop is None:
                pop = sum(p for _c, _n, par, p in self.districts if par == code)
            w.writerow([code, name, parent, pop])
        return out.getvalue().encode("utf-8")

    def render_wide(self, rows):
        codes = []
        for r in rows:
            if r[1] not in codes:
                codes.append(r[1])
        cells = {}
        for r in rows:
            cells.setdefault((r[1], r[5]), r[2])  # the first occurrence, as a reader keeps it
        out = io.StringIO(newline="")
        w = csv.writer(out, delimiter=";", lineterminator="\r\n")
        w.writerow(["date"] + codes)
        for d in range(DAYS):
            w.writerow([dmy(d)] + ["" if (c, d) not in cells else cells[(c, d)] for c in codes])
        return b"\xef\xbb\xbf" + out.getvalue().encode("utf-8")

    def build(self):
        self.draw()
        self.plant()
        current_rows = self.long_rows(DAYS, previous=False)
        previous_rows = self.long_rows(PREVIOUS_DAYS, previous=True)
        # Line numbers of the duplicate rows (header is line 1; one record per line).
        for entry in self.problems:
            if entry["kind"] == "duplicate_row":
                lines = [i + 2 for i, r in enumerate(current_rows)
                         if r[1] == entry["region"] and r[0] == entry["first"]]
                entry["lines"] = lines
        files = {
            FILE_REGIONS: self.render_register(),
            FILE_CURRENT: self.render_long(current_rows),
            FILE_PREVIOUS: self.render_long(previous_rows),
            FILE_WIDE: self.render_wide(current_rows),
        }
        manifest = {
            "schema_version": SCHEMA_VERSION,
            "scenario": "The Republic of Quenmara (invented): four provinces, fourteen districts.",
            "invented": True,
            "generator": "samples/generate.py",
            "command": "python3 samples/generate.py --seed %d --out samples/" % self.seed,
            "seed": self.seed,
            "parameters": PARAMETERS,
            "files": {
                FILE_REGIONS: {"role": "region register", "columns": ["code", "name", "parent", "population"],
                               "rows": len(REGIONS)},
                FILE_CURRENT: {"role": "current release", "layout": "long", "delimiter": ",",
                               "columns": ["date", "region", "cases", "deaths"],
                               "first": iso(0), "last": iso(DAYS - 1), "rows": len(current_rows),
                               "line_ending": "CRLF"},
                FILE_PREVIOUS: {"role": "previous release", "layout": "long", "delimiter": ",",
                                "columns": ["date", "region", "cases", "deaths"],
                                "first": iso(0), "last": iso(PREVIOUS_DAYS - 1), "rows": len(previous_rows),
                                "line_ending": "CRLF"},
                FILE_WIDE: {"role": "the current release's cases, dates down", "layout": "dates-down",
                            "delimiter": ";", "date_format": "DD/MM/YYYY", "bom": True,
                            "measure": "cases", "first": iso(0), "last": iso(DAYS - 1),
                            "note": "A cell is empty where the current release has no row."},
            },
            "district_waves": self.waves,
            "problems": self.problems,
        }
        # The bytes each entry describes, so a reader without Python can tell the files still match.
        for name, info in manifest["files"].items():
            info["bytes"] = len(files[name])
            info["sha256"] = hashlib.sha256(files[name]).hexdigest()
        files[FILE_MANIFEST] = (json.dumps(manifest, indent=2, ensure_ascii=False) + "\n").encode("utf-8")
        return files


# ---------------------------------------------------------------------------------------------
# Verification: read the files back with the csv module and check every claim of the manifest.


def read_long(data):
    text = data.decode("utf-8")
    rows = list(csv.reader(io.StringIO(text, newline="")))
    if rows[0] != ["date", "region", "cases", "deaths"]:
        raise ValueError("unexpected header %r" % rows[0])
    table = {}
    lines = {}
    for i, r in enumerate(rows[1:]):
        if len(r) != 4:
            raise ValueError("line %d has %d fields" % (i + 2, len(r)))
        datetime.date.fromisoformat(r[0])
        key = (r[1], r[0])
        lines.setdefault(key, []).append(i + 2)
        table.setdefault(key, (int(r[2]), int(r[3])))
    return table, lines


def verify(files):
    problems = []

    def check(cond, message):
        if not cond:
            problems.append(message)

    manifest = json.loads(files[FILE_MANIFEST].decode("utf-8"))
    for name, info in manifest["files"].items():
        check(hashlib.sha256(files[name]).hexdigest() == info["sha256"], "%s: sha256 differs" % name)
    register = list(csv.reader(io.StringIO(files[FILE_REGIONS].decode("utf-8"), newline="")))
    check(register[0] == ["code", "name", "parent", "population"], "register header")
    codes = [r[0] for r in register[1:]]
    parents = {r[0]: r[2] for r in register[1:]}
    population = {r[0]: int(r[3]) for r in register[1:]}
    for code, parent in parents.items():
        check(parent == "" or parent in parents, "parent %s of %s not in register" % (parent, code))
    for code in codes:
        kids = [c for c, p in parents.items() if p == code]
        if kids:
            check(population[code] == sum(population[k] for k in kids), "population of %s" % code)

    cur, cur_lines = read_long(files[FILE_CURRENT])
    prev, _ = read_long(files[FILE_PREVIOUS])
    measure_index = {"cases": 0, "deaths": 1}

    def value(table, region, day, measure):
        v = table.get((region, day))
        return None if v is None else v[measure_index[measure]]

    variant_codes = set()
    for p in manifest["problems"]:
        if p["kind"] in ("code_variant", "unknown_code"):
            variant_codes.add(p["region"])
    for (region, _day) in cur:
        check(region in parents or region in variant_codes, "unexpected code %s" % region)

    def days(first, last):
        a = datetime.date.fromisoformat(first)
        b = datetime.date.fromisoformat(last)
        return [(a + datetime.timedelta(days=i)).isoformat() for i in range((b - a).days + 1)]

    for p in manifest["problems"]:
        k, r, m = p["kind"], p["region"], p["measure"]
        tag = "%s %s %s" % (p["id"], k, r)
        if k == "code_collision":
            check(r in codes and any(reg == r for reg, _ in cur), tag + ": code not in the files")
        elif k in ("code_variant", "unknown_code"):
            check(r not in codes, tag + ": variant is in the register")
            if k == "code_variant":
                present = sorted(d for reg, d in cur if reg == r)
                check(present == days(p["rows_first"], p["rows_last"]), tag + ": variant days")
                check(not any((p["canonical"], d) in cur for d in present), tag + ": both codes on one day")
        elif k == "stale_values":
            vals = [value(cur, r, d, m) for d in days(p["first"], p["last"])]
            check(len(set(vals)) == 1 and vals[0] == p["value"] and vals[0] != 0, tag + ": run")
            before = (datetime.date.fromisoformat(p["first"]) - datetime.timedelta(days=1)).isoformat()
            after = (datetime.date.fromisoformat(p["last"]) + datetime.timedelta(days=1)).isoformat()
            check(value(cur, r, before, m) != p["value"] and value(cur, r, after, m) != p["value"],
                  tag + ": run is longer than stated")
        elif k == "duplicate_row":
            check(cur_lines.get((r, p["first"])) == p["lines"] and len(p["lines"]) == 2, tag + ": lines")
        elif k == "backlog_dump":
            check(value(cur, r, p["first"], m) == p["reported"], tag + ": reported value")
            check(p["reported"] - p["true_value"] == p["excess"], tag + ": excess")
        elif k == "reporting_gap":
            check(all(value(cur, r, d, m) == 0 for d in days(p["first"], p["last"])), tag + ": zeros")
        elif k == "negative_count":
            check(value(cur, r, p["first"], m) == p["reported"] < 0, tag + ": negative")
        elif k == "missing_dates":
            check(m is None, tag + ": a missing row misses every measure")
            check(all((r, d) not in cur for d in days(p["first"], p["last"])), tag + ": rows present")
            check(len(days(p["first"], p["last"])) == p["days"], tag + ": day count")
        elif k == "revision" and p["change"] == "region_appeared":
            check(any(reg == r for reg, _ in cur) and not any(reg == r for reg, _ in prev),
                  tag + ": region did not appear")
        elif k == "revision":
            for c in p["cells"]:
                check(value(cur, r, c["date"], m) == c["new"] and value(prev, r, c["date"], m) == c["old"]
                      and c["new"] != c["old"], tag + ": cell %s" % c["date"])
        elif k == "hierarchy_mismatch":
            for day in p["days"]:
                s = sum(value(cur, c, day["date"], m) for c in p["children"])
                check(s == day["children_sum"] and value(cur, r, day["date"], m) == day["parent_reported"]
                      and day["difference"] != 0, tag + ": day %s" % day["date"])
        elif k == "weekday_effect":
            check(r is None and all(x["region"] in codes for x in p.get("regions", [])), tag + ": regions")
        else:
            check(False, tag + ": unknown kind")

    # Everything not planted agrees: province rows sum their children outside the mismatch, and
    # the previous release equals the current one outside the revised cells.
    revised = {(p["region"], c["date"], p["measure"]) for p in manifest["problems"] if p["kind"] == "revision"
               for c in p.get("cells", [])}
    for (region, day), v in prev.items():
        for m, i in measure_index.items():
            if (region, day, m) not in revised:
                check(cur.get((region, day), (None, None))[i] == v[i],
                      "previous differs at %s %s %s" % (region, day, m))
    for (region, day) in cur:
        check((region, day) in prev or day > manifest["files"][FILE_PREVIOUS]["last"],
              "current has a row missing from previous at %s %s" % (region, day))
    mismatch = {(p["region"], d["date"]) for p in manifest["problems"] if p["kind"] == "hierarchy_mismatch"
                for d in p["days"]}
    for prov in REPORTED_PROVINCES:
        kids = [c for c, p in parents.items() if p == prov]
        for (region, day), v in cur.items():
            if region != prov:
                continue
            if all((c, day) in cur for c in kids):
                s = sum(cur[(c, day)][0] for c in kids)
                check((s == v[0]) != ((prov, day) in mismatch), "province sum %s %s" % (prov, day))

    # The wide file: semicolon, BOM, DD/MM/YYYY, the current cases.
    wide = files[FILE_WIDE]
    check(wide.startswith(b"\xef\xbb\xbf"), "wide file BOM")
    rows = list(csv.reader(io.StringIO(wide[3:].decode("utf-8"), newline=""), delimiter=";"))
    header = rows[0]
    check(header[0] == "date" and "NA" in header and "0412" in header, "wide header")
    for r in rows[1:]:
        dd, mm, yyyy = r[0].split("/")
        day = datetime.date(int(yyyy), int(mm), int(dd)).isoformat()
        for code, cell in zip(header[1:], r[1:]):
            want = value(cur, code, day, "cases")
            check((cell == "" and want is None) or (cell != "" and int(cell) == want),
                  "wide cell %s %s" % (code, day))
    return problems


# ---------------------------------------------------------------------------------------------


def write_atomically(path, data):
    folder = os.path.dirname(os.path.abspath(path))
    fd, tmp = tempfile.mkstemp(prefix=".tmp-", dir=folder)
    try:
        with os.fdopen(fd, "wb") as f:
            f.write(data)
            f.flush()
            os.fsync(f.fileno())
        os.chmod(tmp, 0o644)
        os.replace(tmp, path)
    except BaseException:
        if os.path.exists(tmp):
            os.unlink(tmp)
        raise


def main(argv):
    parser = argparse.ArgumentParser(description="Generate the invented Quenmara demo drop.")
    parser.add_argument("--seed", type=int, default=DEFAULT_SEED)
    group = parser.add_mutually_exclusive_group(required=True)
    group.add_argument("--out", help="folder to write the files into")
    group.add_argument("--check", help="folder whose files must equal a fresh generation")
    args = parser.parse_args(argv)

    files = Scenario(args.seed).build()
    failures = verify(files)
    if failures:
        for f in failures:
            print("manifest check failed: " + f, file=sys.stderr)
        return 1
    if args.out:
        os.makedirs(args.out, exist_ok=True)
        for name, data in files.items():
            write_atomically(os.path.join(args.out, name), data)
        total = sum(len(d) for d in files.values())
        print("wrote %d files, %d bytes, to %s" % (len(files), total, args.out))
        return 0
    differing = []
    for name, data in files.items():
        path = os.path.join(args.check, name)
        try:
            with open(path, "rb") as f:
                on_disk = f.read()
        except OSError as e:
            differing.append("%s: %s" % (name, e.strerror))
            continue
        if on_disk != data:
            differing.append("%s differs from a fresh generation with seed %d" % (name, args.seed))
    on_disk_files = {n: open(os.path.join(args.check, n), "rb").read() for n in files
                     if os.path.exists(os.path.join(args.check, n))}
    if len(on_disk_files) == len(files):
        differing += ["on disk: " + f for f in verify(on_disk_files)]
    for d in differing:
        print(d, file=sys.stderr)
    if differing:
        return 1
    print("%d files match seed %d and the manifest holds" % (len(files), args.seed))
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
