#include "siftwave/ledger/replay.h"

#include "ledger/effects.h"

#include <boost/date_time/posix_time/posix_time.hpp>

#include <pwd.h>
#include <unistd.h>
#include <cctype>
#include <cstdlib>
#include <map>

namespace siftwave::ledger {

namespace {

bool blank(const std::string& s) {
    for (unsigned char c : s) {
        if (!std::isspace(c))
            return false;
    }
    return true;
}

Error entryError(ErrorCode code, std::uint64_t sequence, const std::string& message,
                 const Error* cause = nullptr) {
    Error e = makeError(code, "entry " + std::to_string(sequence) + ": " + message);
    if (cause) {
        e.region = cause->region;
        e.date = cause->date;
    }
    e.line = sequence;
    return e;
}

std::string describeCell(const CellChange& c) {
    return c.measure + " " + c.region + " " + c.date.iso() + " " +
           cleanedStateName(c.before.state) + " " + std::to_string(c.before.value) + " -> " +
           cleanedStateName(c.after.state) + " " + std::to_string(c.after.value);
}

/// The first difference between a recorded and a re-derived effect, for the message.
std::string firstDifference(const Effect& recorded, const Effect& derived) {
    const std::size_t n = std::min(recorded.cells.size(), derived.cells.size());
    for (std::size_t i = 0; i < n; ++i) {
        if (!(recorded.cells[i] == derived.cells[i])) {
            return "recorded cell " + describeCell(recorded.cells[i]) + ", replay gives " +
                   describeCell(derived.cells[i]);
        }
    }
    if (recorded.cells.size() != derived.cells.size()) {
        return "it records " + std::to_string(recorded.cells.size()) +
               " changed cells, replay gives " + std::to_string(derived.cells.size());
    }
    const std::size_t t = std::min(recorded.totals.size(), derived.totals.size());
    for (std::size_t i = 0; i < t; ++i) {
        if (!(recorded.totals[i] == derived.totals[i])) {
            const TotalChange& a = recorded.totals[i];
            const TotalChange& b = derived.totals[i];
            return "recorded total of " + a.measure + " in " + a.region + " " +
                   std::to_string(a.before) + " -> " + std::to_string(a.after) + ", replay gives " +
                   b.measure + " in " + b.region + " " + std::to_string(b.before) + " -> " +
                   std::to_string(b.after);
        }
    }
    return "it records " + std::to_string(recorded.totals.size()) + " totals, replay gives " +
           std::to_string(derived.totals.size());
}

}  // namespace

std::string defaultAuthor() {
    for (const char* var : {"LOGNAME", "USER"}) {
        const char* v = std::getenv(var);
        if (v && *v)
            return v;
    }
    if (const passwd* pw = ::getpwuid(::getuid()); pw && pw->pw_name && *pw->pw_name)
        return pw->pw_name;
    return "unknown";
}

std::string utcTimestampNow() {
    const auto now = boost::posix_time::second_clock::universal_time();
    const auto d = now.date();
    const auto t = now.time_of_day();
    char buffer[64];
    std::snprintf(buffer, sizeof buffer, "%04d-%02d-%02dT%02d:%02d:%02dZ",
                  static_cast<int>(d.year()), static_cast<int>(d.month()),
                  static_cast<int>(d.day()), static_cast<int>(t.hours()),
                  static_cast<int>(t.minutes()), static_cast<int>(t.seconds()));
    return buffer;
}

bool isUtcTimestamp(std::string_view text) {
    if (text.size() != 20 || text[10] != 'T' || text[19] != 'Z' || text[13] != ':' ||
        text[16] != ':')
        return false;
    if (!Date::fromIso(text.substr(0, 10)))
        return false;
    auto two = [&](std::size_t at, int max) {
        if (!std::isdigit(static_cast<unsigned char>(text[at])) ||
            !std::isdigit(static_cast<unsigned char>(text[at + 1])))
            return false;
        return (text[at] - '0') * 10 + (text[at + 1] - '0') <= max;
    };
    return two(11, 23) && two(14, 59) && two(17, 60);
}

std::string describeRead(const ReadNarrowing& narrowing) {
    return narrowing.active() ? "the read narrowed by " + narrowing.asOptions()
                              : std::string("the whole file");
}

namespace {

/// Entries made on one read of the drop replay only on the same read: a narrowed read holds other
/// periods and regions than the whole file (its totals differ), so the two are never mixed.
Status checkSameRead(const ReadNarrowing& recorded, const Drop& drop, const std::string& what) {
    if (recorded == drop.source.narrowing)
        return Ok{};
    return makeError(ErrorCode::Integrity,
                     what + " made on " + describeRead(recorded) + ", and this drop is " +
                         describeRead(drop.source.narrowing) + ": read it as " +
                         (recorded.active() ? "the ledger was, with " + recorded.asOptions()
                                            : std::string("a whole file, without --from, --to and "
                                                          "--only-regions")) +
                         ", or keep another ledger for this read");
}

}  // namespace

Result<Effect> previewDecision(const Drop& drop, const Cleaned& cleaned, const Decision& decision) {
    return detail::deriveEffect(drop, cleaned, decision);
}

Result<LedgerEntry> draftEntry(const Drop& drop, const Ledger& ledger, const Cleaned& cleaned,
                               const Decision& decision, const EntryMeta& meta) {
    if (blank(meta.reason))
        return makeError(ErrorCode::Usage, "every decision needs a reason; give one");
    if (drop.source.sha256.empty())
        return makeError(ErrorCode::Usage, "the drop has no SHA-256 to bind the entry to");
    if (!ledger.entries.empty() && ledger.dropSha256() != drop.source.sha256) {
        return makeError(ErrorCode::Integrity, "the ledger belongs to another drop (SHA-256 " +
                                                   ledger.dropSha256() + ", this drop is " +
                                                   drop.source.sha256 + ")");
    }
    if (!ledger.entries.empty()) {
        if (Status s =
                checkSameRead(ledger.entries.front().narrowing, drop, "the ledger's entries were");
            !s)
            return s.error();
    }
    if (cleaned.entryCount() != ledger.entries.size()) {
        return makeError(ErrorCode::Usage, "the cleaned data is not the replay of this ledger");
    }
    const std::string timestamp = meta.timestamp.empty() ? utcTimestampNow() : meta.timestamp;
    if (!isUtcTimestamp(timestamp)) {
        return makeError(ErrorCode::Usage,
                         "the time must be UTC ISO 8601, YYYY-MM-DDTHH:MM:SSZ: " + timestamp);
    }
    auto effect = previewDecision(drop, cleaned, decision);
    if (!effect)
        return effect.error();
    LedgerEntry entry;
    entry.sequence = ledger.entries.size() + 1;
    entry.timestamp = timestamp;
    entry.author = meta.author.empty() ? defaultAuthor() : meta.author;
    entry.reason = meta.reason;
    entry.decision = decision;
    entry.effect = std::move(*effect);
    entry.dropSha256 = drop.source.sha256;
    entry.narrowing = drop.source.narrowing;
    if (auto s = sealEntry(entry, ledger.entries.empty() ? nullptr : &ledger.entries.back()); !s)
        return s.error();
    return entry;
}

Status applyEntry(const Drop& drop, Cleaned& cleaned, const LedgerEntry& entry) {
    if (entry.sequence != cleaned.entryCount() + 1) {
        return entryError(
            ErrorCode::Integrity, entry.sequence,
            "is out of order (expected entry " + std::to_string(cleaned.entryCount() + 1) + ")");
    }
    if (entry.dropSha256 != drop.source.sha256) {
        return entryError(ErrorCode::Integrity, entry.sequence,
                          "was made on another drop (SHA-256 " + entry.dropSha256 +
                              ", this drop is " + drop.source.sha256 + ")");
    }
    if (Status s = checkSameRead(entry.narrowing, drop, "was"); !s)
        return entryError(ErrorCode::Integrity, entry.sequence, s.error().message);
    if (blank(entry.reason))
        return entryError(ErrorCode::Integrity, entry.sequence, "has no reason");
    auto derived = detail::deriveEffect(drop, cleaned, entry.decision);
    if (!derived) {
        return entryError(derived.error().code, entry.sequence,
                          "cannot be replayed on this drop: " + derived.error().message,
                          &derived.error());
    }
    if (!(*derived == entry.effect)) {
        return entryError(
            ErrorCode::Integrity, entry.sequence,
            "its recorded cells or totals differ from what its decision gives on this drop (" +
                firstDifference(entry.effect, *derived) + ")");
    }
    return detail::applyEffect(drop, cleaned, entry.decision, *derived);
}

Result<Cleaned> replay(const Drop& drop, const Ledger& ledger) {
    if (auto s = verifyChain(ledger); !s)
        return s.error();
    if (!ledger.entries.empty() && ledger.dropSha256() != drop.source.sha256) {
        return makeError(ErrorCode::Integrity, "the ledger belongs to another drop (SHA-256 " +
                                                   ledger.dropSha256() + ", this drop is " +
                                                   drop.source.sha256 + ")");
    }
    if (!ledger.entries.empty()) {
        if (Status s =
                checkSameRead(ledger.entries.front().narrowing, drop, "the ledger's entries were");
            !s)
            return s.error();
    }
    Cleaned cleaned(drop);
    for (const LedgerEntry& entry : ledger.entries) {
        if (auto s = applyEntry(drop, cleaned, entry); !s)
            return s.error();
    }
    if (auto s = checkConservation(drop, cleaned, ledger); !s)
        return s.error();
    return cleaned;
}

std::int64_t rawTotal(const Drop& drop, std::size_t measure, std::size_t region) {
    std::int64_t sum = 0;
    for (const Cell& c : drop.series(measure, region)) {
        if (c.reported())
            sum += c.value;
    }
    return sum;
}

Status checkConservation(const Drop& drop, const Cleaned& cleaned, const Ledger& ledger) {
    std::map<std::pair<std::string, std::string>, std::int64_t> stated;
    std::map<std::pair<std::string, std::string>, std::uint64_t> lastEntry;
    for (const LedgerEntry& e : ledger.entries) {
        for (const TotalChange& t : e.effect.totals) {
            stated[{t.measure, t.region}] += t.change();
            if (t.change() != 0)
                lastEntry[{t.measure, t.region}] = e.sequence;
        }
    }
    for (std::size_t m = 0; m < drop.measures.size(); ++m) {
        for (std::size_t r = 0; r < drop.regionCodes.size(); ++r) {
            std::int64_t cells = 0;
            for (const CleanedCell& c : cleaned.series(m, r))
                cells += c.counted();
            const auto key = std::make_pair(drop.measures[m], drop.regionCodes[r]);
            const std::int64_t expected =
                rawTotal(drop, m, r) + (stated.count(key) ? stated[key] : 0);
            if (cells != expected || cleaned.total(m, r) != cells) {
                Error e = makeError(ErrorCode::Conservation,
                                    "the cleaned total of " + drop.measures[m] + " is " +
                                        std::to_string(cells) +
                                        " but the raw total and the recorded changes give " +
                                        std::to_string(expected));
                e.region = drop.regionCodes[r];
                if (lastEntry.count(key))
                    e.line = lastEntry[key];
                return e;
            }
        }
    }
    return Ok{};
}

}  // namespace siftwave::ledger
