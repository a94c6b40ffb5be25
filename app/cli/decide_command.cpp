// siftwave-cli decide LEDGER --drop FILE KIND [parameters] --reason TEXT [--author NAME]:
// appends one decision to the ledger (created if needed).
#include "commands.h"
#include "common.h"
#include "ledger_support.h"

#include "siftwave/ledger/decision.h"
#include "siftwave/ledger/decision_kinds.h"
#include "siftwave/ledger/ledger_file.h"
#include "siftwave/ledger/replay.h"
#include "siftwave/scan/propose.h"

#include <algorithm>
#include <cstdio>
#include <cstdlib>

namespace siftwave::cli {
namespace {

const char* kUsage =
    "usage: siftwave-cli decide LEDGER --drop FILE KIND [parameters] --reason TEXT\n"
    "                           [--author NAME] [--dry-run] [ingest flags] [--json]\n"
    "\n"
    "Records one cleaning decision in the ledger LEDGER (JSON Lines, created if needed),\n"
    "after checking it on the drop FILE and the decisions already in the ledger. Every\n"
    "decision needs a reason. Decisions that move counts keep each region's total exactly.\n"
    "\n"
    "KIND and its parameters:\n";

// After the kinds' own lines (decision_kinds.h).
const char* kUsageTail =
    "Any kind takes --finding ID, the scan finding the decision answers. --measure may be\n"
    "left out when the drop has one measure. Dates are YYYY-MM-DD. Decisions act on the\n"
    "drop's periods: in a weekly drop a date names the week that holds it (any day of it),\n"
    "a range FIRST:LAST every week from FIRST's to LAST's, and 'day' above reads 'week'.\n"
    "--periods FIRST:LAST is another name for --days.\n"
    "\n"
    "Exit codes: 0 recorded, 1 bad input or a decision refused (nothing written), 2 wrong usage.\n"
    "\n"
    "options:\n";

std::vector<FlagSpec> decideFlagSpecs() {
    return withJsonHelpAndIngestFlags(
        {
            {"drop", true, false, "FILE", "the data drop the ledger belongs to (required)"},
            {"reason", true, false, "TEXT", "why: required, not blank"},
            {"author", true, false, "NAME", "who decides (default: the OS user)"},
            {"region", true, false, "CODE", "region code, verbatim"},
            {"measure", true, false, "NAME", "measure (default: the drop's only measure)"},
            {"date", true, false, "DAY",
             "the day (or week) decided on (redistribute, spread_negative, resolve_duplicate)"},
            {"excess", true, false, "N|auto",
             "redistribute: counts to move, or auto (the scan's estimate)"},
            {"window", true, false, "FIRST:LAST",
             "redistribute: receiving days; spread_negative: absorbing days"},
            {"days", true, false, "FIRST:LAST",
             "fill_missing, exclude, accept: the days (or weeks)"},
            {"periods", true, false, "FIRST:LAST", "the same as --days, for weekly data"},
            {"method", true, false, "NAME",
             "redistribute: uniform|proportional|baseline; fill_missing: zero|linear|share"},
            {"baseline-width", true, false, "N",
             "redistribute --method baseline: moving-average width, odd 3..21 (default 7)"},
            {"keep", true, false, "RULE", "resolve_duplicate: first|last|sum|max"},
            {"variant", true, false, "CODE", "merge_codes: the code folded away"},
            {"into", true, false, "CODE", "merge_codes: the canonical code kept"},
            {"entry", true, false, "N", "withdraw: the id of the entry to undo"},
            {"finding", true, false, "ID", "the scan finding this decision answers"},
            {"dry-run", false, false, "", "show what the decision would do; write nothing"},
        },
        "print JSON instead of text");
}

std::string usageText() {
    std::string text = kUsage;
    for (const ledger::DecisionKindInfo* k : ledger::decisionKinds()) {
        std::string name = k->name;
        name.resize(std::max<std::size_t>(name.size(), 19), ' ');
        text += "  " + name + k->help;
    }
    return text + kUsageTail + formatFlags(decideFlagSpecs());
}

/// "redistribute, spread_negative, ... or withdraw".
std::string kindNames() {
    std::string names;
    const auto kinds = ledger::decisionKinds();
    for (std::size_t i = 0; i < kinds.size(); ++i) {
        if (i > 0)
            names += i + 1 == kinds.size() ? " or " : ", ";
        names += kinds[i]->name;
    }
    return names;
}

Error usage(std::string message) {
    return makeError(ErrorCode::Usage, std::move(message));
}

Result<ledger::DayRange> rangeFlag(const ParsedArgs& args, const char* name) {
    const std::string text = args.value(name);
    auto r = ledger::DayRange::fromIso(text);
    if (r)
        return *r;
    // Say which part is wrong: a day the calendar does not have, or a range that runs backwards.
    const std::size_t colon = text.find(':');
    if (colon != std::string::npos && text.find(':', colon + 1) == std::string::npos) {
        const std::string firstText = text.substr(0, colon);
        const std::string lastText = text.substr(colon + 1);
        const auto first = Date::fromIso(firstText);
        const auto last = Date::fromIso(lastText);
        for (const auto& [day, dayText] :
             {std::pair{first, firstText}, std::pair{last, lastText}}) {
            if (!day && dayText.size() == 10 && dayText[4] == '-' && dayText[7] == '-') {
                return usage(std::string("--") + name + ": '" + dayText +
                             "' is not a day of the calendar; give real days as "
                             "YYYY-MM-DD:YYYY-MM-DD");
            }
        }
        if (first && last && *last < *first) {
            return usage(std::string("--") + name + " '" + text +
                         "' ends before it starts; give FIRST:LAST with FIRST <= LAST");
        }
    }
    return usage(std::string("--") + name +
                 " takes FIRST:LAST as YYYY-MM-DD:YYYY-MM-DD, FIRST <= LAST, not '" + text + "'");
}

Result<std::int64_t> positiveFlag(const ParsedArgs& args, const char* name) {
    const std::string text = args.value(name);
    char* end = nullptr;
    const long long v = std::strtoll(text.c_str(), &end, 10);
    if (text.empty() || *end != '\0' || v <= 0)
        return usage(std::string("--") + name + " takes a whole number greater than 0, not '" +
                     text + "'");
    return static_cast<std::int64_t>(v);
}

/// The decision the flags describe (the excess left at 0 for --excess auto).
Result<ledger::Decision> decisionFrom(const ParsedArgs& args, ledger::DecisionKind kind,
                                      const Drop& drop) {
    const ledger::DecisionKindInfo& info = ledger::decisionKindInfo(kind);
    // A flag some kind takes, given to one that does not (in the order of the flag list).
    for (const FlagSpec& spec : decideFlagSpecs()) {
        const std::string& flag = spec.name;
        const auto someKindTakes = [&](const ledger::DecisionKindInfo* k) { return k->flag(flag); };
        if (args.has(flag) && !info.flag(flag) &&
            std::any_of(ledger::decisionKinds().begin(), ledger::decisionKinds().end(),
                        someKindTakes))
            return usage("--" + flag + " does not apply to " + info.name);
    }
    ledger::Decision d;
    d.kind = kind;
    d.region = args.value("region");
    d.measure = args.value("measure");
    d.finding = args.value("finding");
    if (info.measureFromDrop && d.measure.empty() && drop.measures.size() == 1)
        d.measure = drop.measures.front();
    if (args.has("date")) {
        auto date = Date::fromIso(args.value("date"));
        if (!date)
            return usage("--date takes a real day as YYYY-MM-DD, not '" + args.value("date") + "'");
        d.date = *date;
    }
    if (args.has("window")) {
        auto r = rangeFlag(args, "window");
        if (!r)
            return r.error();
        d.window = *r;
    }
    if (args.has("days") && args.has("periods"))
        return usage("--days and --periods are one flag; give one of them");
    for (const char* name : {"days", "periods"}) {
        if (!args.has(name))
            continue;
        auto r = rangeFlag(args, name);
        if (!r)
            return r.error();
        d.window = *r;
    }
    if (args.has("excess") && args.value("excess") != "auto") {
        auto n = positiveFlag(args, "excess");
        if (!n)
            return n.error();
        d.excess = *n;
    }
    if (args.has("baseline-width")) {
        auto n = positiveFlag(args, "baseline-width");
        if (!n)
            return n.error();
        d.baselineWidth = static_cast<int>(*n);
    }
    if (args.has("method")) {
        const std::string m = args.value("method");
        if (info.hasParameter(ledger::DecisionParam::RedistributeMethod)) {
            auto method = ledger::redistributeMethodFromName(m);
            if (!method)
                return usage(
                    "--method for redistribute is uniform, proportional or baseline, not '" + m +
                    "'");
            d.redistributeMethod = *method;
        } else {
            auto method = ledger::fillMethodFromName(m);
            if (!method)
                return usage("--method for fill_missing is zero, linear or share, not '" + m + "'");
            d.fillMethod = *method;
        }
    }
    if (args.has("keep")) {
        auto rule = ledger::duplicateRuleFromName(args.value("keep"));
        if (!rule)
            return usage("--keep is first, last, sum or max, not '" + args.value("keep") + "'");
        d.duplicateRule = *rule;
    }
    d.variant = args.value("variant");
    d.into = args.value("into");
    if (args.has("entry")) {
        auto n = positiveFlag(args, "entry");
        if (!n)
            return n.error();
        d.target = static_cast<std::uint64_t>(*n);
    }
    for (const ledger::DecisionFlag& flag : info.flags) {
        if (flag.requiredAs && !args.has(flag.name))
            return usage(std::string(info.name) + " needs " + flag.requiredAs);
    }
    return d;
}

/// --excess auto: the scan's backlog estimate for the day (and its window when none is given).
Status resolveAutoExcess(const Drop& drop, ledger::Decision& d, bool windowGiven);
void printAutoExcessNote(const ledger::Decision& d, bool windowGiven);

nlohmann::json effectSummaryJson(const ledger::Effect& effect) {
    nlohmann::json totals = nlohmann::json::array();
    for (const ledger::TotalChange& t : effect.totals)
        totals.push_back({{"region", t.region},
                          {"measure", t.measure},
                          {"before", t.before},
                          {"after", t.after}});
    nlohmann::json cells = nlohmann::json::array();
    for (const ledger::CellChange& c : effect.cells) {
        cells.push_back({{"region", c.region},
                         {"measure", c.measure},
                         {"date", c.date.iso()},
                         {"before", c.before.hasValue() ? nlohmann::json(c.before.value)
                                                        : nlohmann::json(nullptr)},
                         {"after", c.after.hasValue() ? nlohmann::json(c.after.value)
                                                      : nlohmann::json(nullptr)},
                         {"state_before", ledger::cleanedStateName(c.before.state)},
                         {"state_after", ledger::cleanedStateName(c.after.state)}});
    }
    return {{"cells", cells}, {"totals", totals}};
}

/// "2026-03-02", or for a week "2026-03-02 (2026-W10)".
std::string periodText(const Drop& drop, Date date) {
    if (!drop.axis.weekly())
        return date.iso();
    const std::optional<std::int32_t> p = drop.periodOf(date);
    return p ? date.iso() + " (" + drop.axis.periodName(*p) + ")" : date.iso();
}

void printEffectText(const Drop& drop, const ledger::Effect& effect) {
    const std::size_t shown = std::min<std::size_t>(effect.cells.size(), 40);
    for (std::size_t i = 0; i < shown; ++i) {
        const ledger::CellChange& c = effect.cells[i];
        auto value = [](const ledger::CleanedCell& cell) {
            return cell.hasValue() ? std::to_string(cell.value)
                                   : std::string(ledger::cleanedStateName(cell.state));
        };
        std::printf("  %s %s %s: %s -> %s\n", periodText(drop, c.date).c_str(),
                    terminalText(c.region).c_str(), c.measure.c_str(), value(c.before).c_str(),
                    value(c.after).c_str());
    }
    if (effect.cells.size() > shown)
        std::printf("  ... %zu more cells\n", effect.cells.size() - shown);
    for (const ledger::TotalChange& t : effect.totals) {
        std::printf("  total %s %s: %lld -> %lld%s\n", terminalText(t.region).c_str(),
                    terminalText(t.measure).c_str(), static_cast<long long>(t.before),
                    static_cast<long long>(t.after), t.before == t.after ? " (unchanged)" : "");
    }
}

}  // namespace

int runDecide(int argc, char** argv, int first) {
    const CommandLine line = parseWithPositionals(argc, argv, first, decideFlagSpecs(), usageText(),
                                                  2, "decide needs LEDGER and KIND");
    if (!line.args)
        return line.exitCode;
    const ParsedArgs* args = &*line.args;
    const bool json = line.json;
    const std::string ledgerPath = args->positional[0];
    const std::optional<ledger::DecisionKind> kind =
        ledger::decisionKindFromName(args->positional[1]);
    if (!kind) {
        return usageError("unknown decision kind '" + args->positional[1] + "'; use " + kindNames(),
                          json, usageText());
    }
    if (!args->has("drop"))
        return usageError("decide needs --drop FILE, the drop the ledger belongs to", json,
                          usageText());
    const bool dryRun = args->has("dry-run");
    if (!dryRun && args->value("reason").find_first_not_of(" \t\r\n") == std::string::npos)
        return usageError("every decision needs a reason: --reason TEXT", json, usageText());
    if (samePath(ledgerPath, args->value("drop")))
        return usageError("the ledger cannot be the drop file itself", json, usageText());
    if (!ingestFlagsValid(*args, json))
        return kExitUsage;

    const std::optional<Drop> drop = valueOrPrintError(loadDrop(args->value("drop"), *args), json);
    if (!drop)
        return kExitBadInput;
    Result<ledger::Decision> decision = decisionFrom(*args, *kind, *drop);
    if (!decision)
        return usageError(decision.error().message, json, usageText());
    const bool autoExcess =
        *kind == ledger::DecisionKind::Redistribute && args->value("excess") == "auto";
    const bool windowGiven = args->has("window");
    if (autoExcess) {
        if (Status s = resolveAutoExcess(*drop, *decision, windowGiven); !s) {
            printError(s.error(), json);
            return s.error().code == ErrorCode::Usage ? kExitUsage : kExitBadInput;
        }
    }
    if (Status s = decision->validate(); !s)
        return usageError(s.error().message, json, usageText());

    const std::optional<ReplayedLedger> replayed = openAndReplay(*drop, ledgerPath, true, json);
    if (!replayed)
        return kExitBadInput;
    const ledger::Ledger* ledger = &replayed->ledger;
    const ledger::Cleaned* cleaned = &replayed->cleaned;

    if (dryRun) {
        Result<ledger::Effect> effect = ledger::previewDecision(*drop, *cleaned, *decision);
        if (!effect) {
            printError(effect.error(), json);
            return kExitBadInput;
        }
        if (json) {
            nlohmann::json out = effectSummaryJson(*effect);
            out["dry_run"] = true;
            out["kind"] = ledger::decisionKindName(*kind);
            printJson(out);
        } else {
            std::printf("%s (dry run, nothing written):\n", ledger::decisionKindName(*kind));
            if (autoExcess)
                printAutoExcessNote(*decision, windowGiven);
            printEffectText(*drop, *effect);
        }
        return kExitOk;
    }

    ledger::EntryMeta meta;
    meta.author = args->value("author");
    meta.reason = args->value("reason");
    Result<ledger::LedgerEntry> entry =
        ledger::draftEntry(*drop, *ledger, *cleaned, *decision, meta);
    if (!entry) {
        printError(entry.error(), json);
        return entry.error().code == ErrorCode::Usage ? kExitUsage : kExitBadInput;
    }
    if (Status s = ledger::appendLedgerEntry(ledgerPath, *entry); !s) {
        printError(s.error(), json);
        return kExitBadInput;
    }
    if (json) {
        nlohmann::json out = {{"ledger", ledgerPath}, {"entry", entryToJsonObject(*entry)}};
        if (autoExcess) {
            out["excess_from"] = "scan backlog estimate";
            out["window_from"] = windowGiven ? "--window" : "scan backlog estimate";
        }
        printJson(out);
    } else {
        std::printf("entry %llu recorded in %s: %s by %s\n",
                    static_cast<unsigned long long>(entry->sequence), ledgerPath.c_str(),
                    ledger::decisionKindName(*kind), entry->author.c_str());
        if (autoExcess)
            printAutoExcessNote(*decision, windowGiven);
        printEffectText(*drop, entry->effect);
    }
    return kExitOk;
}

namespace {

void printAutoExcessNote(const ledger::Decision& d, bool windowGiven) {
    // Say where each number came from: --window given by hand is not the scan's suggestion.
    if (windowGiven) {
        std::printf("  excess %lld from the scan's backlog estimate; window %s as given\n",
                    static_cast<long long>(d.excess), d.window->iso().c_str());
    } else {
        std::printf("  excess %lld and window %s from the scan's backlog estimate\n",
                    static_cast<long long>(d.excess), d.window->iso().c_str());
    }
}

Status resolveAutoExcess(const Drop& drop, ledger::Decision& d, bool windowGiven) {
    if (d.region.empty() || d.measure.empty() || !d.date)
        return makeError(ErrorCode::Usage, "--excess auto needs --region, --measure and --date");
    // The GUI's rule for a picked bar (scan/propose.h). No findings are passed: decide does
    // not run the scan, and a backlog_dump's suggestion is this same estimate.
    scan::ProposalRequest request;
    request.region = d.region;
    request.measure = d.measure;
    request.day = *d.date;
    Result<scan::Proposal> proposal = scan::proposeDecision(drop, request);
    if (!proposal || proposal->noEstimate) {
        Error e = proposal ? *proposal->noEstimate : proposal.error();
        e.message = "the scan cannot estimate an excess for this " +
                    std::string(drop.axis.unitName()) + ": " + e.message;
        return e;
    }
    const scan::BacklogEstimate& estimate = *proposal->estimate;
    if (estimate.excess <= 0) {
        Error e =
            makeError(ErrorCode::InvalidValue,
                      "the scan estimates no excess for this " + std::string(drop.axis.unitName()) +
                          " (observed " + std::to_string(estimate.observed) + ", expected about " +
                          std::to_string(static_cast<long long>(estimate.expected + 0.5)) +
                          "); give --excess N to move counts anyway");
        e.region = d.region;
        e.date = d.date->iso();
        return e;
    }
    d.excess = proposal->decision.excess;
    if (!windowGiven)
        d.window = proposal->decision.window;
    return Ok{};
}

}  // namespace

}  // namespace siftwave::cli
