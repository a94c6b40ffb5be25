#pragma once
// Generated case lists with a known event curve and a known delay distribution, for the
// nowcast's checks (tests/core/nowcast_*_test.cpp, tests/bench/nowcast_bench.cpp).
//
// Events: Poisson counts per day with mean `curve(day)`. Delays: drawn from `delayPmf` (days
// 0 .. size-1), or from `laterPmf` for events on or after `changeDay` (a delay that changes
// midway). Each case is one row "onset,report" (ISO dates); the list is sorted by onset.

#include "siftwave/date.h"

#include <cmath>
#include <cstdint>
#include <functional>
#include <random>
#include <string>
#include <vector>

namespace siftwave::testing {

struct GeneratedCase {
    Date event;
    Date report;
};

struct CaseListSpec {
    Date first = *Date::fromIso("2026-01-05");
    int days = 70;
    std::function<double(int)> curve = [](int day) {
        return 5.0 + 55.0 * std::exp(-0.5 * std::pow((day - 40.0) / 12.0, 2));
    };
    std::vector<double> delayPmf = {0.15, 0.20, 0.20, 0.15, 0.10, 0.06,
                                    0.05, 0.03, 0.02, 0.02, 0.02};
    std::vector<double> laterPmf;  // empty: no change
    int changeDay = 0;
    std::uint64_t seed = 1;
};

inline std::vector<GeneratedCase> generateCases(const CaseListSpec& spec) {
    std::mt19937_64 rng(spec.seed);
    std::discrete_distribution<int> before(spec.delayPmf.begin(), spec.delayPmf.end());
    std::discrete_distribution<int> after =
        spec.laterPmf.empty()
            ? before
            : std::discrete_distribution<int>(spec.laterPmf.begin(), spec.laterPmf.end());
    std::vector<GeneratedCase> cases;
    for (int day = 0; day < spec.days; ++day) {
        std::poisson_distribution<int> count(spec.curve(day));
        const int n = count(rng);
        for (int i = 0; i < n; ++i) {
            const bool late = !spec.laterPmf.empty() && day >= spec.changeDay;
            const int delay = late ? after(rng) : before(rng);
            cases.push_back({spec.first + day, spec.first + day + delay});
        }
    }
    return cases;
}

/// The cases as a case list's CSV text.
inline std::string caseListText(const std::vector<GeneratedCase>& cases) {
    std::string out = "onset,report\n";
    for (const GeneratedCase& c : cases)
        out += c.event.iso() + "," + c.report.iso() + "\n";
    return out;
}

/// The final count of each day (every case, however late), days 0 .. days-1.
inline std::vector<double> finalCounts(const std::vector<GeneratedCase>& cases, Date first,
                                       int days) {
    std::vector<double> out(static_cast<std::size_t>(days), 0.0);
    for (const GeneratedCase& c : cases) {
        const int i = c.event - first;
        if (i >= 0 && i < days)
            out[static_cast<std::size_t>(i)] += 1.0;
    }
    return out;
}

/// The release as of `asOf`: a long CSV "date,region,cases" of the cases reported by then,
/// per event day from `first` to asOf (zeros written).
inline std::string releaseText(const std::vector<GeneratedCase>& cases, Date first, Date asOf) {
    std::vector<int> counts(static_cast<std::size_t>(asOf - first + 1), 0);
    for (const GeneratedCase& c : cases) {
        if (c.report <= asOf && c.event >= first && c.event <= asOf)
            ++counts[static_cast<std::size_t>(c.event - first)];
    }
    std::string out = "date,region,cases\n";
    for (std::size_t i = 0; i < counts.size(); ++i)
        out += (first + static_cast<int>(i)).iso() + ",all," + std::to_string(counts[i]) + "\n";
    return out;
}

}  // namespace siftwave::testing
