#pragma once
// Seeded synthetic Drops for tests and benchmarks: clean epidemic curves with
// negative-binomial noise and a weekday reporting effect, and planters that add
// known problems with their truth recorded. Daily by default; with `weeks` set,
// a weekly drop of ISO weeks (the same model in weeks, without a weekday effect).
//
// Model: for region r and period t (a day, or a week),
//   mu_r(t) = w(t) * s_r * (b + sum_k a_k exp(-(t - c_k - d_r)^2 / (2 v_k^2)))
//   x_r(t) ~ NegBin(mean mu, size k): Poisson(lambda), lambda ~ Gamma(k, mu / k),
// so Var x = mu + mu^2 / k (the gamma-Poisson mixture; e.g. Hilbe, "Negative
// Binomial Regression", 2nd ed., ch. 5). w is a weekday factor (mean 1; 1 for
// weekly data), s_r a region scale drawn log-uniformly, c_k, v_k the waves'
// centres and widths (8-22 days; 2.5-6 weeks for weekly data, the width of a
// seasonal influenza wave), d_r a region's delay (up to 10 days either way). The same options
// always give the same drop (std::mt19937_64 with libstdc++'s distributions).

#include "siftwave/drop.h"

#include <array>
#include <climits>
#include <cstdint>
#include <string>
#include <vector>

namespace siftwave::testing {

struct SyntheticOptions {
    std::uint64_t seed = 1;
    int regions = 40;
    int days = 240;
    int weeks = 0;                        // > 0: a weekly drop of this many ISO weeks (days unused)
    std::string firstDay = "2026-01-05";  // a Monday
    int waves = 3;
    double minPeak = 5;        // smallest region's peak mean per period (day or week)
    double maxPeak = 400;      // largest region's peak mean per period
    double floorShare = 0.05;  // b: level between waves, as a share of the peak
    double size = 25;          // negative-binomial size k (smaller = more overdispersed)
    std::array<double, 7> weekday{1.2, 1.15, 1.05, 1.0, 1.0, 0.85, 0.75};  // Mon..Sun
    bool deaths = false;  // a second measure "deaths" at about 1 % of cases
};

/// A problem planted on purpose; days are period indices into the calendar.
struct PlantedProblem {
    std::string kind;  // a FindingKind name: "backlog_dump", "reporting_gap", ...
    std::size_t region = 0;
    std::int32_t first = 0;
    std::int32_t last = 0;
    std::int64_t amount = 0;  // counts moved, the negative value, ...
};

struct SyntheticDrop {
    Drop drop;
    std::vector<double> mean;  // regions x days: the expected count of measure 0 (row-major)
    std::vector<PlantedProblem> planted;
};

/// Region codes "K01", "K02", ... (an invented country's districts).
SyntheticDrop makeSyntheticDrop(const SyntheticOptions& options = {});

// Planters: each changes measure 0 of one region and records the truth.
/// Holds back `share` of each of the `heldDays` days before `day` and reports it on `day`.
void plantBacklogDump(SyntheticDrop& s, std::size_t region, std::int32_t day, int heldDays,
                      double share = 0.8);
/// Zeros on first .. first + days - 1, their counts reported on the day after.
void plantReportingGap(SyntheticDrop& s, std::size_t region, std::int32_t first, int days);
/// No rows on first .. first + days - 1 (every measure).
void plantMissingDates(SyntheticDrop& s, std::size_t region, std::int32_t first, int days);
/// Sets the day's value to `value` (< 0).
void plantNegative(SyntheticDrop& s, std::size_t region, std::int32_t day, std::int32_t value);
/// A second row for the day; with another value when `differentValue` is not 0.
void plantDuplicate(SyntheticDrop& s, std::size_t region, std::int32_t day,
                    std::int32_t differentValue = 0);
/// Copies the value of `first` forward over the next days - 1 days.
void plantStaleValues(SyntheticDrop& s, std::size_t region, std::int32_t first, int days);

/// In handBuiltDrop() series: a day with no row.
inline constexpr std::int32_t kNoRow = INT32_MIN;
/// In handBuiltDrop() series: a row whose value is blank.
inline constexpr std::int32_t kBlank = INT32_MIN + 1;

/// A small drop from literal series (one per code, all of one length), for unit
/// tests of single detectors. Lines are numbered as in toLongCsv().
Drop handBuiltDrop(const std::vector<std::string>& codes,
                   const std::vector<std::vector<std::int32_t>>& series,
                   const std::string& firstDay = "2026-03-02",
                   const std::string& measure = "cases");

/// The same with several measures: series[m][r] is measure m of region r.
Drop handBuiltDrop(const std::vector<std::string>& codes, const std::vector<std::string>& measures,
                   const std::vector<std::vector<std::vector<std::int32_t>>>& series,
                   const std::string& firstDay = "2026-03-02");

/// handBuiltDrop() with weekly periods: ISO weeks from `firstMonday` (2026-03-02 is the
/// Monday of 2026-W10), each value one week's count.
Drop handBuiltWeeklyDrop(const std::vector<std::string>& codes,
                         const std::vector<std::vector<std::int32_t>>& series,
                         const std::string& firstMonday = "2026-03-02",
                         const std::string& measure = "cases");

/// The drop as a long CSV (duplicates are not written): "date,region,cases[,deaths]", one row per
/// date and region in date order; absent cells have no row, blank cells an empty field.
std::string toLongCsv(const Drop& drop);

}  // namespace siftwave::testing
