// libFuzzer target: dates as drops write them (every format of ingest/date_parsing.h) and the
// week calendars of time_axis.h. Parsing never crashes; a parsed date round-trips through ISO
// 8601 text, and its week (ISO 8601 and Sunday-start epidemiological) names a week that starts
// on the day weekStartOf() gives.
#include "ingest/date_parsing.h"
#include "siftwave/date.h"
#include "siftwave/time_axis.h"

#include <cstddef>
#include <cstdint>
#include <string_view>

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
    const std::string_view text(reinterpret_cast<const char*>(data), size);
    using siftwave::ingest::detail::DateFormat;
    (void)siftwave::ingest::detail::dateShapeOf(text);
    for (DateFormat f : {DateFormat::Iso, DateFormat::Compact, DateFormat::DayFirst,
                         DateFormat::MonthFirst, DateFormat::IsoWeek}) {
        const auto d = siftwave::ingest::detail::parseDateAs(text, f);
        if (!d)
            continue;
        if (siftwave::Date::fromIso(d->iso()) != d)
            __builtin_trap();
        for (siftwave::WeekStart s : {siftwave::WeekStart::Monday, siftwave::WeekStart::Sunday}) {
            const siftwave::WeekNumber w = siftwave::weekNumberOf(*d, s);
            const auto start = siftwave::weekStartDate(w, s);
            if (start && *start != siftwave::weekStartOf(*d, s))
                __builtin_trap();
        }
    }
    return 0;
}
