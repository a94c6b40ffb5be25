// siftwave-cli decide LEDGER --drop FILE KIND [parameters] --reason TEXT [--author NAME]:
// appends one decision to the ledger (created if needed).
#include "commands.h"
#include "common.h"
#include "ledger_support.h"

#include "siftwave/ledger/decision.h"
#include "siftwave/ledger/decision_kinds.h"
#include "siftwave/ledger/ledger_file.h"
#include "siftwave/ledger/record.h"
#include "siftwave/ledger/replay.h"
#include "siftwave/ledger/signing.h"
#include "siftwave/scan/decision_check.h"
#include "siftwave/scan/propose.h"

#include <algorithm>
#include <cstdio>
#include <cstdlib>
#include <filesystem>

namespace siftwave::cli {
namespace {

const char* kUsage =
    "usage: siftwave-cli decide LEDGER --drop FILE KIND [parameters] --reason TEXT\n"
    "                           [--author NAME] [--sign [--key FILE]] [--dry-run] [ingest flags]\n"
    "                           [--json]\n"
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
             "the day (or week) decided on (redistribute, spread_negative, resolve_duplicate); "
             "nowcast_complete: now (default: the case list's last report date)"},
            {"excess", true, false, "N|auto",
             "redistribute: counts to move, or auto (the scan's estimate)"},
            {"window", true, false, "FIRST:LAST",
             "redistribute: receiving days; spread_negative: absorbing days"},
            {"days", true, false, "FIRST:LAST",
             "fill_missing, exclude, accept: the days (or weeks)"},
            {"periods", true, false, "FIRST:LAST", "the same as --days, for weekly data"},
            {"method", true, false, "NAME",
             "redistribute: uniform|proportional|baseline|level; fill_missing: zero|linear|share"},
            {"baseline-width", true, false, "N",
             "redistribute --method baseline: moving-average width; --method level: periods on "
             "each side of the trend; odd 3..21 (default 7)"},
            {"keep", true, false, "RULE", "resolve_duplicate: first|last|sum|max"},
            {"variant", true, false, "CODE", "merge_codes: the code folded away"},
            {"into", true, false, "CODE", "merge_codes: the canonical code kept"},
            {"entry", true, false, "N", "withdraw: the id of the entry to undo"},
            {"max-delay", true, false, "N",
             "nowcast_complete: maximum delay in periods (default: 99% of the delays seen)"},
            {"nowcast-window", true, false, "N",
             "nowcast_complete: moving window of the delays in periods (default 21 days, 6 "
             "weeks)"},
            {"finding", true, false, "ID", "the scan finding this decision answers"},
            {"dry-run", false, false, "", "show what the decision would do; write nothing"},
            {"sign", false, false, "",
             "sign the entry with your Ed25519 key (siftwave-cli signing-key --create)"},
            {"key", true, false, "FILE", "--sign: the private key (default: your data folder's)"},
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

/// Fails when a flag that some kind takes is given to a kind that does not take it (the first
/// such flag in the order of the flag list).
Status rejectFlagsNotTaken(const ParsedArgs& args, const ledger::DecisionKindInfo& info) {
    for (const FlagSpec& spec : decideFlagSpecs()) {
        const std::string& flag = spec.name;
        const auto someKindTakes = [&](const ledger::DecisionKindInfo* k) { return k->flag(flag); };
        if (args.has(flag) && !info.flag(flag) &&
            std::any_of(ledger::decisionKinds().begin(), ledger::decisionKinds().end(),
                        someKindTakes))
            return usage("--" + flag + " does not apply to " + info.name);
    }
    return Ok{};
}

/// A decision of the kind with the flags that are plain text: --region, --measure (the drop's
/// only measure when it is left out and the kind allows that), --finding, --variant and --into.
ledger::Decision decisionWithTextFlags(const ParsedArgs& args, const ledger::DecisionKindInfo& info,
                                       const Drop& drop) {
    ledger::Decision d;
    d.kind = info.kind;
    d.region = args.value("region");
    d.measure = args.value("measure");
    d.finding = args.value("finding");
    if (info.measureFromDrop && d.measure.empty() && drop.measures.size() == 1)
        d.measure = drop.measures.front();
    d.variant = args.value("variant");
    d.into = args.value("into");
    return d;
}

/// The days: --date, --window, and --days or --periods (not both).
Status readDayFlags(const ParsedArgs& args, ledger::Decision& d) {
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
    return Ok{};
}

/// The counts: --excess (left at 0 for auto) and --baseline-width.
Status readCountFlags(const ParsedArgs& args, ledger::Decision& d) {
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
    return Ok{};
}

/// The named rules: --method (a redistribution method for the kinds that take one, else a fill
/// method) and --keep.
Status readRuleFlags(const ParsedArgs& args, ledger::Decision& d) {
    if (args.has("method")) {
        const std::string m = args.value("method");
        if (ledger::decisionKindInfo(d.kind).hasParameter(
                ledger::DecisionParam::RedistributeMethod)) {
            auto method = ledger::redistributeMethodFromName(m);
            if (!method)
                return usage(
                    "--method for redistribute is uniform, proportional, baseline or level, not '" +
                    m + "'");
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
    return Ok{};
}

/// --entry: the entry a withdrawal undoes.
Status readEntryFlag(const ParsedArgs& args, ledger::Decision& d) {
    if (args.has("entry")) {
        auto n = positiveFlag(args, "entry");
        if (!n)
            return n.error();
        d.target = static_cast<std::uint64_t>(*n);
    }
    return Ok{};
}

/// nowcast_complete's --max-delay and --nowcast-window (left at 0: from the data).
Status readNowcastFlags(const ParsedArgs& args, ledger::Decision& d) {
    for (auto [name, out] :
         {std::pair{"max-delay", &d.maxDelay}, std::pair{"nowcast-window", &d.nowcastWindow}}) {
        if (!args.has(name))
            continue;
        auto n = positiveFlag(args, name);
        if (!n)
            return n.error();
        if (*n > 366)
            return usage(std::string("--") + name + " takes 1 to 366 periods");
        *out = static_cast<int>(*n);
    }
    return Ok{};
}

/// Fails when a flag the kind needs is not given (the first in the kind's flag list).
Status checkRequiredFlags(const ParsedArgs& args, const ledger::DecisionKindInfo& info) {
    for (const ledger::DecisionFlag& flag : info.flags) {
        if (flag.requiredAs && !args.has(flag.name))
            return usage(std::string(info.name) + " needs " + flag.requiredAs);
    }
    return Ok{};
}

/// The decision the flags describe (the excess left at 0 for --excess auto): no flag the kind
/// does not take, the text flags, then the days, counts, rules and entry in turn, then the flags
/// the kind needs.
Result<ledger::Decision> decisionFrom(const ParsedArgs& args, ledger::DecisionKind kind,
                                      const Drop& drop) {
    const ledger::DecisionKindInfo& info = ledger::decisionKindInfo(kind);
    if (Status s = rejectFlagsNotTaken(args, info); !s)
        return s.error();
    ledger::Decision d = decisionWithTextFlags(args, info, drop);
    using FlagStep = Status (*)(const ParsedArgs&, ledger::Decision&);
    for (FlagStep step :
         {readDayFlags, readCountFlags, readRuleFlags, readEntryFlag, readNowcastFlags}) {
        if (Status s = step(args, d); !s)
            return s.error();
    }
    if (Status s = checkRequiredFlags(args, info); !s)
        return s.error();
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
                    terminalText(c.region).c_str(), terminalText(c.measure).c_str(),
                    value(c.before).c_str(), value(c.after).c_str());
    }
    if (effect.cells.size() > shown)
        std::printf("  ... %zu more cells\n", effect.cells.size() - shown);
    for (const ledger::TotalChange& t : effect.totals) {
        std::printf("  total %s %s: %lld -> %lld%s\n", terminalText(t.region).c_str(),
                    terminalText(t.measure).c_str(), static_cast<long long>(t.before),
                    static_cast<long long>(t.after), t.before == t.after ? " (unchanged)" : "");
    }
}

/// What the decide command line asks for, once its usage has been checked.
struct DecideRequest {
    const ParsedArgs& args;
    bool json = false;
    std::string ledgerPath;
    ledger::DecisionKind kind;
    bool dryRun = false;       // --dry-run: show the effect, write nothing
    bool autoExcess = false;   // redistribute --excess auto: the scan's estimate
    bool windowGiven = false;  // --window given by hand (with autoExcess, not the scan's)
};

/// The request the command line makes, or nullopt after a usage error (its exit code in
/// `exitCode`): a known KIND, --drop, a reason unless --dry-run, a ledger that is not the drop
/// itself, and valid ingest flags.
std::optional<DecideRequest> decideRequest(const ParsedArgs& args, bool json, int& exitCode) {
    const auto refuse = [&](const std::string& message) {
        exitCode = usageError(message, json, usageText());
        return std::nullopt;
    };
    const std::optional<ledger::DecisionKind> kind =
        ledger::decisionKindFromName(args.positional[1]);
    if (!kind)
        return refuse("unknown decision kind '" + args.positional[1] + "'; use " + kindNames());
    if (!args.has("drop"))
        return refuse("decide needs --drop FILE, the drop the ledger belongs to");
    DecideRequest request{args, json, args.positional[0], *kind};
    request.dryRun = args.has("dry-run");
    if (!request.dryRun && args.value("reason").find_first_not_of(" \t\r\n") == std::string::npos)
        return refuse("every decision needs a reason: --reason TEXT");
    if (samePath(request.ledgerPath, args.value("drop")))
        return refuse("the ledger cannot be the drop file itself");
    if (!ingestFlagsValid(args, json)) {
        exitCode = kExitUsage;
        return std::nullopt;
    }
    request.autoExcess =
        *kind == ledger::DecisionKind::Redistribute && args.value("excess") == "auto";
    request.windowGiven = args.has("window");
    return request;
}

/// The decision the flags describe, its excess (and window) from the scan for --excess auto,
/// validated; or nullopt after printing the error (its exit code in `exitCode`).
std::optional<ledger::Decision> checkedDecision(const DecideRequest& request, const Drop& drop,
                                                int& exitCode) {
    Result<ledger::Decision> decision = decisionFrom(request.args, request.kind, drop);
    if (!decision) {
        exitCode = usageError(decision.error().message, request.json, usageText());
        return std::nullopt;
    }
    if (request.autoExcess) {
        if (Status s = resolveAutoExcess(drop, *decision, request.windowGiven); !s) {
            printError(s.error(), request.json);
            exitCode = s.error().code == ErrorCode::Usage ? kExitUsage : kExitBadInput;
            return std::nullopt;
        }
    }
    // What the kind leaves to the data (nowcast_complete: now, the maximum delay, the window)
    // is named before the entry is recorded.
    if (const auto resolve = ledger::decisionKindInfo(request.kind).resolve) {
        if (Status s = resolve(drop, *decision); !s) {
            printError(s.error(), request.json);
            exitCode = kExitBadInput;
            return std::nullopt;
        }
    }
    if (Status s = decision->validate(); !s) {
        exitCode = usageError(s.error().message, request.json, usageText());
        return std::nullopt;
    }
    return std::move(*decision);
}

/// The check's lines under the effect: what a scan after the decision would newly find.
void printCheckText(const scan::DecisionCheck& check, Cadence cadence) {
    if (check.clean()) {
        std::printf(
            "check: a scan after this decision finds nothing new in the series it "
            "changes\n");
        return;
    }
    std::printf("check: this decision would create what a scan flags (look before deciding):\n");
    for (const std::string& line : scan::describeDecisionCheck(check, cadence))
        std::printf("  %s\n", terminalText(line).c_str());
}

/// --dry-run: prints what the decision would do to the cleaned data and writes nothing; returns
/// the exit code.
int printDryRun(const DecideRequest& request, const Drop& drop, const ReplayedLedger& replayed,
                const ledger::Decision& decision) {
    Result<ledger::Effect> effect = ledger::previewDecision(drop, replayed.cleaned, decision);
    if (!effect) {
        printError(effect.error(), request.json);
        return kExitBadInput;
    }
    // What the decision would newly make look wrong (scan/decision_check.h), with the scan's
    // default thresholds, as the decision pane shows it.
    Result<scan::DecisionCheck> check = scan::checkDecision(drop, replayed.cleaned, decision);
    if (!check) {
        printError(check.error(), request.json);
        return kExitBadInput;
    }
    if (request.json) {
        nlohmann::json out = effectSummaryJson(*effect);
        out["dry_run"] = true;
        out["kind"] = ledger::decisionKindName(request.kind);
        out["check"] = scan::decisionCheckToJson(*check);
        printJson(out);
    } else {
        std::printf("%s (dry run, nothing written):\n", ledger::decisionKindName(request.kind));
        if (request.autoExcess)
            printAutoExcessNote(decision, request.windowGiven);
        printEffectText(drop, *effect);
        printCheckText(*check, drop.axis.cadence());
    }
    return kExitOk;
}

/// Prints the entry just recorded: as JSON, or a line and its effect.
void printRecordedEntry(const DecideRequest& request, const Drop& drop,
                        const ledger::Decision& decision, const ledger::LedgerEntry& entry) {
    if (request.json) {
        nlohmann::json out = {{"ledger", request.ledgerPath}, {"entry", entryToJsonObject(entry)}};
        if (request.autoExcess) {
            out["excess_from"] = "scan backlog estimate";
            out["window_from"] = request.windowGiven ? "--window" : "scan backlog estimate";
        }
        printJson(out);
    } else {
        std::printf("entry %llu recorded in %s: %s by %s\n",
                    static_cast<unsigned long long>(entry.sequence),
                    terminalText(request.ledgerPath).c_str(),
                    ledger::decisionKindName(request.kind), terminalText(entry.author).c_str());
        if (entry.signature)
            std::printf("  signed with key %s\n", entry.signature->publicKey.substr(0, 16).c_str());
        if (request.autoExcess)
            printAutoExcessNote(decision, request.windowGiven);
        printEffectText(drop, entry.effect);
    }
}

/// The signing key for --sign: --key FILE, else the user's key (signing.h); nullopt after
/// printing why there is none.
std::optional<ledger::SigningKey> signerFor(const DecideRequest& request) {
    const std::string path =
        request.args.has("key") ? request.args.value("key") : ledger::defaultSigningKeyPath();
    std::error_code ec;
    if (!std::filesystem::exists(path, ec)) {
        Error e = makeError(ErrorCode::NotFound,
                            "no signing key here; make one with siftwave-cli signing-key --create "
                            "(nothing was recorded)");
        e.file = path;
        printError(e, request.json);
        return std::nullopt;
    }
    Result<ledger::SigningKey> key = ledger::SigningKey::load(path);
    if (!key) {
        printError(key.error(), request.json);
        return std::nullopt;
    }
    return *key;
}

/// Records the decision after the replayed ledger (drafted again if another writer appended
/// first, record.h) and prints it; returns the exit code.
int recordDecision(const DecideRequest& request, const Drop& drop, ReplayedLedger replayed,
                   const ledger::Decision& decision) {
    ledger::RecordRequest record;
    record.ledgerPath = request.ledgerPath;
    record.decision = decision;
    record.meta.author = request.args.value("author");
    record.meta.reason = request.args.value("reason");
    std::optional<ledger::SigningKey> signer;
    if (request.args.has("sign")) {
        signer = signerFor(request);
        if (!signer)
            return kExitBadInput;
        record.signer = &*signer;
    }
    Result<ledger::Recorded> recorded = ledger::recordDecision(
        drop, record, std::move(replayed.ledger), std::move(replayed.cleaned));
    if (!recorded) {
        printError(recorded.error(), request.json);
        return recorded.error().code == ErrorCode::Usage ? kExitUsage : kExitBadInput;
    }
    if (recorded->attempts > 1 && !request.json)
        std::printf(
            "another writer added entries meanwhile; the decision was checked again on "
            "them and recorded after them\n");
    printRecordedEntry(request, drop, decision, recorded->entry);
    return kExitOk;
}

}  // namespace

int runDecide(int argc, char** argv, int first) {
    const CommandLine line = parseWithPositionals(argc, argv, first, decideFlagSpecs(), usageText(),
                                                  2, "decide needs LEDGER and KIND");
    if (!line.args)
        return line.exitCode;
    int exitCode = kExitOk;
    const std::optional<DecideRequest> request = decideRequest(*line.args, line.json, exitCode);
    if (!request)
        return exitCode;
    const std::optional<Drop> drop =
        valueOrPrintError(loadDrop(line.args->value("drop"), *line.args), line.json);
    if (!drop)
        return kExitBadInput;
    const std::optional<ledger::Decision> decision = checkedDecision(*request, *drop, exitCode);
    if (!decision)
        return exitCode;
    const std::optional<ReplayedLedger> replayed =
        openAndReplay(*drop, request->ledgerPath, true, line.json);
    if (!replayed)
        return kExitBadInput;
    if (request->dryRun)
        return printDryRun(*request, *drop, *replayed, *decision);
    return recordDecision(*request, *drop, std::move(*replayed), *decision);
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
