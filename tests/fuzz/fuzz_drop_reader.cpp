// libFuzzer target: the CSV drop reader with sniffing, layout and role detection and the
// calendar plan, on arbitrary bytes. The reader must return a Drop or an Error, never crash,
// hang or read out of bounds (ASan/UBSan in the fuzz build), and a Drop it returns must hold
// together: every table is regions x periods, every duplicate points inside the calendar.
// The last byte also picks forced options, so the weekly, long, daily and case-list paths are
// reached, and a narrowed read (--from, --to, --only-regions), whose drop must keep only the
// regions asked for and periods that overlap the range.
#include "siftwave/ingest/ingest.h"

#include <algorithm>
#include <cstddef>
#include <cstdint>
#include <string_view>

namespace {

void checkDrop(const siftwave::Drop& drop) {
    const auto regions = drop.regionCodes.size();
    const auto periods = static_cast<std::size_t>(drop.periods());
    if (drop.tables.size() != drop.measures.size())
        __builtin_trap();
    for (const siftwave::CellTable& t : drop.tables)
        if (t.regions() != regions || (regions > 0 && t.days() != periods))
            __builtin_trap();
    for (const siftwave::DuplicateRow& d : drop.duplicates)
        if (d.day < 0 || static_cast<std::size_t>(d.day) >= periods || d.region >= regions ||
            d.measure >= drop.measures.size())
            __builtin_trap();
    const siftwave::ReadNarrowing& asked = drop.source.narrowing;
    for (const std::string& code : drop.regionCodes)
        if (!asked.regions.empty() &&
            !std::binary_search(asked.regions.begin(), asked.regions.end(), code))
            __builtin_trap();
    if (periods > 0 && asked.from && drop.axis.periodEnd(0) < *asked.from)
        __builtin_trap();
    if (periods > 0 && asked.to && drop.axis.lastStart() > *asked.to)
        __builtin_trap();
    if (drop.caseList) {  // every case counted inside the calendar, in a region of the drop
        for (const siftwave::CaseRecord& c : drop.caseList->cases)
            if (c.region >= regions || !drop.periodOf(c.event))
                __builtin_trap();
        for (const siftwave::CaseProblem& p : drop.caseList->problems)
            if (p.region >= regions || p.line == 0)
                __builtin_trap();
    }
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
    const std::string_view bytes(reinterpret_cast<const char*>(data), size);
    siftwave::ingest::IngestOptions options;
    if (auto drop = siftwave::ingest::parseDrop(bytes, "fuzz.csv", options); drop.ok())
        checkDrop(*drop);
    if (size == 0)
        return 0;
    switch (data[size - 1] % 6) {
        case 1:
            options.cadence = siftwave::Cadence::Weekly;
            break;
        case 2:
            options.layout = siftwave::Layout::Long;
            break;
        case 3:
            options.cadence = siftwave::Cadence::Daily;
            break;
        case 4:
            options.weekStart = siftwave::WeekStart::Sunday;
            options.weekDate = siftwave::WeekDate::End;
            break;
        case 5:
            options.caseList = true;
            break;
        default:
            break;
    }
    // Bits above the choice of options: a narrowed read.
    switch (data[size - 1] / 6 % 4) {
        case 1:
            options.narrowing.from = siftwave::Date::fromIso("2026-01-07");
            break;
        case 2:
            options.narrowing.to = siftwave::Date::fromIso("2026-02-01");
            break;
        case 3:
            options.narrowing.regions = {"1", "A", "N1", "b"};
            break;
        default:
            if (data[size - 1] % 6 == 0)
                return 0;
    }
    if (auto drop = siftwave::ingest::parseDrop(bytes, "fuzz.csv", options); drop.ok())
        checkDrop(*drop);
    return 0;
}
