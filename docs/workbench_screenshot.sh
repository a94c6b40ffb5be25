#!/usr/bin/env bash
# Regenerates docs/workbench.png, the README's screenshot: the sample drop as a project whose
# ledger spreads back 1301's three-week backlog (samples/manifest.json P06) and 1304's catch-up
# after its outage (P08), rendered without a display. Needs a Qt build (siftwave, siftwave-cli).
#   bash docs/workbench_screenshot.sh [BUILD_DIR]     (default: build)
set -euo pipefail
root=$(cd "$(dirname "$0")/.." && pwd)
build=${1:-$root/build}
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
drop=$root/samples/quenmara_current.csv
cli=$build/bin/siftwave-cli

# The scan's finding ids, so the ledger entries answer them.
"$cli" scan "$drop" --json >"$work/scan.json"
finding() {
    python3 -c 'import json, sys
for f in json.load(open(sys.argv[1]))["findings"]:
    if f["kind"] == "backlog_dump" and f["region"] == sys.argv[2]:
        print(f["id"])' "$work/scan.json" "$1"
}

ledger=$work/morning.ledger.jsonl
"$cli" decide "$ledger" redistribute --drop "$drop" --region 1301 --measure cases \
    --date 2026-08-24 --excess auto --window 2026-08-03:2026-08-23 --method proportional \
    --finding "$(finding 1301)" --author analyst \
    --reason "Three weeks of held-back cases reported on 2026-08-24; spread back over 2026-08-03..23 in proportion to what was reported" >/dev/null
"$cli" decide "$ledger" redistribute --drop "$drop" --region 1304 --measure cases \
    --date 2026-04-27 --excess auto --method baseline --finding "$(finding 1304)" \
    --author analyst --reason "Catch-up after the five-day outage; spread over the outage days" >/dev/null

# The project (siftwave/ledger/project.h): the drop, its register, the ledger's head, region 1301.
python3 - "$work" "$root/samples" <<'PY'
import json, sys
work, samples = sys.argv[1], sys.argv[2]
lines = open(f"{work}/morning.ledger.jsonl").read().splitlines()
last = json.loads(lines[-1])
project = {
    "format": "siftwave-project", "version": 1,
    "drop": {"path": f"{samples}/quenmara_current.csv", "sha256": last["drop_sha256"]},
    "previous_drop": None,
    "register": {"path": f"{samples}/quenmara_regions.csv"},
    "ledger": {"path": "morning.ledger.jsonl", "entries": len(lines), "head_hash": last["hash"]},
    "view": {"region": "1301", "measure": "cases", "second_measure": "",
             "visible_first": None, "visible_last": None},
    "fit": {"model": "gumbel", "method": "lsq", "window_first": None, "window_last": None,
            "smoothing_days": 7},
    # The transmission panel under the plot: R_t with an illustrative serial interval (gamma,
    # mean 4.7 d, sd 2.9 d; invented for the sample scenario).
    "extra": {"transmission.si_mean": "4.7", "transmission.si_sd": "2.9"},
}
json.dump(project, open(f"{work}/morning.siftwave.json", "w"), indent=2)
PY

QT_QPA_PLATFORM=offscreen XDG_RUNTIME_DIR=${XDG_RUNTIME_DIR:-$work} \
    "$build/bin/siftwave" --screenshot "$root/docs/workbench.png" "$work/morning.siftwave.json"
