#include "ingest/role_detection.h"

#include "ingest/date_parsing.h"
#include "ingest/header_words.h"

#include <algorithm>
#include <array>
#include <cctype>
#include <cmath>
#include <cstdint>
#include <numeric>
#include <unordered_map>
#include <unordered_set>

namespace siftwave::ingest::detail {
namespace {

std::string quotedName(std::string_view name) {
    std::string out;
    out.reserve(name.size() + 2);
    out += '\'';
    out.append(name);
    out += '\'';
    return out;
}

constexpr std::size_t kCellShapes = static_cast<std::size_t>(CellShape::Text) + 1;

struct ColumnProfile {
    std::array<int, kCellShapes> shapes{};  // sample cells of each CellShape
    DateShape dateShape = DateShape::None;
    bool mixedDateShapes = false;
    bool allCompactDates = true;  // every non-empty cell is 8 digits forming a real YYYYMMDD day

    int of(CellShape shape) const { return shapes[static_cast<std::size_t>(shape)]; }
    int nonEmpty() const {
        return std::accumulate(shapes.begin(), shapes.end(), 0) - of(CellShape::Empty);
    }
};

std::vector<ColumnProfile> profile(std::size_t columns, const std::vector<SampleRecord>& rows,
                                   const NumberStyle& style) {
    std::vector<ColumnProfile> out(columns);
    for (const SampleRecord& r : rows) {
        for (std::size_t c = 0; c < columns && c < r.fields.size(); ++c) {
            const std::string& f = r.fields[c];
            ColumnProfile& p = out[c];
            ++p.shapes[static_cast<std::size_t>(shapeOf(f, style))];
            if (f.empty())
                continue;
            const DateShape ds = dateShapeOf(f);
            if (ds != DateShape::None && ds != DateShape::Compact) {
                if (p.dateShape == DateShape::None)
                    p.dateShape = ds;
                else if (p.dateShape != ds)
                    p.mixedDateShapes = true;
            }
            if (!(ds == DateShape::Compact && parseDateAs(f, DateFormat::Compact)))
                p.allCompactDates = false;
        }
    }
    return out;
}

bool isDateColumn(const ColumnProfile& p) {
    if (p.nonEmpty() == 0)
        return false;
    // Most cells are dates: a stray text ("Total") is then reported where it is.
    if (p.of(CellShape::Date) * 2 > p.nonEmpty())
        return true;
    return p.allCompactDates &&
           p.of(CellShape::Integer) + p.of(CellShape::LeadingZero) == p.nonEmpty();
}

bool isNumericColumn(const ColumnProfile& p) {
    const int numbers = p.of(CellShape::Integer) + p.of(CellShape::Decimal);
    return p.nonEmpty() == 0 || numbers * 2 >= p.nonEmpty();
}

bool isCodeColumn(const ColumnProfile& p) {
    return p.nonEmpty() > 0 &&
           (p.of(CellShape::Text) + p.of(CellShape::LeadingZero)) * 2 > p.nonEmpty();
}

/// The columns named by a repeatable flag (--value-col), in the order given.
Result<std::vector<int>> namedColumns(const std::vector<std::string>& names,
                                      const std::vector<std::string>& wanted, const char* flag) {
    std::vector<int> out;
    for (const std::string& w : wanted) {
        Result<int> c = findColumn(names, w, flag);
        if (!c)
            return c.error();
        out.push_back(*c);
    }
    return out;
}

/// The column a flag names (`wanted`, from --year-col and the like); -1 when the flag was not
/// given, a Usage error when there is no such column.
Result<int> namedColumn(const std::vector<std::string>& names, const std::string& wanted,
                        const char* flag) {
    if (wanted.empty())
        return -1;
    return findColumn(names, wanted, flag);
}

/// The columns that play no role in `m`, in column order (one pass: a dates-down file may have
/// thousands of value columns).
std::vector<int> unusedColumnsOf(std::size_t columns, const RoleMapping& m) {
    std::vector<char> used(columns, 0);
    auto mark = [&](int c) {
        if (c >= 0 && static_cast<std::size_t>(c) < columns)
            used[static_cast<std::size_t>(c)] = 1;
    };
    mark(m.dateColumn);
    mark(m.weekColumn);
    mark(m.regionColumn);
    mark(m.measureColumn);
    for (int c : m.valueColumns)
        mark(c);
    for (int c : m.dateColumns)
        mark(c);
    std::vector<int> out;
    for (std::size_t c = 0; c < columns; ++c) {
        if (!used[c])
            out.push_back(static_cast<int>(c));
    }
    return out;
}

// How much each piece of evidence weighs when the layout is chosen (see role_detection.h).
// The weights are judgement, tuned on the tests' files (common practice, no source).
constexpr double kRepeatedDatesWeight = 4.0;  // long: dates repeat (full weight at each date twice)
constexpr double kCodesInRunsWeight = 4.0;    // long: a column holds region codes in runs
constexpr double kDatesOnceWeight = 1.0;      // dates-down: each date once ...
constexpr double kVaryLikeCountsWeight = 2.0;  // ... and no column holds region codes in runs
constexpr double kDigitNamesWeight = 3.0;      // dates-down: the header names are numbers
constexpr double kDecisiveMargin = 2.0;        // closer scores: refuse, the layout is ambiguous
constexpr double kDatesOnceAtMost = 0.05;      // a share of repeated dates still "each date once"
constexpr double kDatesRepeatAtLeast = 0.25;   // a share of repeated dates that means "repeat"
constexpr int kMinRunRows = 8;                 // rows per value of a region-code column in runs
constexpr double kFullWeightRunRows = 50.0;    // a run this long gives codes in runs full weight

/// What the sample says about one column besides its cell shapes.
struct ColumnFacts {
    int cells = 0;     // non-empty cells
    int distinct = 0;  // distinct non-empty texts (counted when codesInRuns or keyWithDate need it)
    int runs = 0;      // blocks of equal consecutive non-empty cells
    bool positiveIntegers = false;  // every non-empty cell is digits, no leading zero, not 0
    bool keyWithDate = false;       // no two rows share the date and the cell (looked at when dates
                                    // repeat and the cells are positive integers)
    std::string_view longestRunText;
    int longestRun = 0;

    /// Numeric region codes of a file sorted by region: few positive integers, each filling one
    /// block of many consecutive rows.
    bool codesInRuns() const {
        return positiveIntegers && runs == distinct && cells >= kMinRunRows * runs;
    }
};

/// The sample, column by column: shapes, header words and the facts above.
struct SampleFacts {
    std::vector<ColumnProfile> profiles;
    std::vector<HeaderWords> words;    // empty words for every column without a header
    std::vector<ColumnFacts> columns;  // filled for every column but the date column
    int dateCells = 0;
    int distinctDates = 0;

    /// The share of date cells that repeat a date seen above them (0: each date once).
    double repeatedDateShare() const {
        return dateCells == 0 ? 0.0 : 1.0 - static_cast<double>(distinctDates) / dateCells;
    }
    bool datesRepeat() const { return repeatedDateShare() >= kDatesRepeatAtLeast; }
};

bool isPositiveInteger(std::string_view text) {
    if (text.empty() || text.size() > 10 || text[0] < '1' || text[0] > '9')
        return false;
    return std::all_of(text.begin(), text.end(), [](char c) { return c >= '0' && c <= '9'; });
}

const std::string* fieldOf(const SampleRecord& r, int column) {
    const auto c = static_cast<std::size_t>(column);
    return c < r.fields.size() ? &r.fields[c] : nullptr;
}

/// Each row's date as an index among the sample's distinct date texts (-1: no date). With a
/// week column the date is the year cell and the week cell together.
std::vector<int> dateIndexOfRows(const std::vector<SampleRecord>& rows, int dateColumn,
                                 int weekColumn, SampleFacts& facts) {
    std::unordered_map<std::string, int> index;
    index.reserve(rows.size());
    std::vector<int> out(rows.size(), -1);
    std::string key;
    for (std::size_t r = 0; r < rows.size(); ++r) {
        const std::string* f = fieldOf(rows[r], dateColumn);
        if (!f || f->empty())
            continue;
        key = *f;
        if (weekColumn >= 0) {
            const std::string* w = fieldOf(rows[r], weekColumn);
            key += '\x1f';
            key += w ? *w : std::string();
        }
        ++facts.dateCells;
        out[r] = index.emplace(key, static_cast<int>(index.size())).first->second;
    }
    facts.distinctDates = static_cast<int>(index.size());
    return out;
}

/// The number of distinct texts among the first cells of the runs of a column (few: the
/// column has at most one run per kMinRunRows cells).
int distinctRunValues(const std::vector<SampleRecord>& rows, int column) {
    std::vector<std::string_view> starts;
    std::string_view previous;
    bool first = true;
    for (const SampleRecord& r : rows) {
        const std::string* f = fieldOf(r, column);
        if (!f || f->empty())
            continue;
        if (first || *f != previous)
            starts.push_back(*f);
        previous = *f;
        first = false;
    }
    std::sort(starts.begin(), starts.end());
    return static_cast<int>(std::unique(starts.begin(), starts.end()) - starts.begin());
}

/// One pass over one column of the sample. Only a column of positive integers is looked at
/// again (what regionEvidence and codesInRuns need): its values in runs when its runs are
/// long, or every value against the date when dates repeat. The count columns of a wide file
/// take the one pass.
ColumnFacts columnFactsOf(const std::vector<SampleRecord>& rows, int column,
                          const std::vector<int>& dateIndex, bool datesRepeat) {
    ColumnFacts k;
    k.positiveIntegers = true;
    std::string_view previous;
    int run = 0;
    for (const SampleRecord& r : rows) {
        const std::string* f = fieldOf(r, column);
        if (!f || f->empty())
            continue;
        ++k.cells;
        if (k.cells > 1 && *f == previous) {
            ++run;
        } else {
            ++k.runs;
            run = 1;
        }
        previous = *f;
        if (run > k.longestRun) {
            k.longestRun = run;
            k.longestRunText = previous;
        }
        if (k.positiveIntegers && !isPositiveInteger(*f))
            k.positiveIntegers = false;
    }
    if (k.cells == 0)
        k.positiveIntegers = false;
    if (!k.positiveIntegers)
        return k;
    if (!datesRepeat) {
        if (k.cells >= kMinRunRows * k.runs)
            k.distinct = distinctRunValues(rows, column);
        return k;
    }
    std::unordered_map<std::string_view, std::uint32_t> values;
    std::unordered_set<std::uint64_t> datedValues;
    values.reserve(rows.size());
    k.keyWithDate = true;
    for (std::size_t r = 0; r < rows.size(); ++r) {
        const std::string* f = fieldOf(rows[r], column);
        if (!f || f->empty())
            continue;
        const std::uint32_t v =
            values.emplace(*f, static_cast<std::uint32_t>(values.size())).first->second;
        if (k.keyWithDate && dateIndex[r] >= 0) {
            const std::uint64_t key = static_cast<std::uint64_t>(dateIndex[r]) << 32 | v;
            k.keyWithDate = datedValues.insert(key).second;
        }
    }
    k.distinct = static_cast<int>(values.size());
    return k;
}

SampleFacts sampleFactsOf(const std::vector<std::string>& names, bool header,
                          const std::vector<SampleRecord>& rows,
                          std::vector<ColumnProfile> profiles, int dateColumn, int weekColumn) {
    SampleFacts facts;
    facts.profiles = std::move(profiles);
    facts.words.resize(names.size());
    if (header) {
        for (std::size_t c = 0; c < names.size(); ++c)
            facts.words[c] = headerWordsOf(names[c]);
    }
    facts.columns.resize(names.size());
    if (dateColumn < 0)
        return facts;
    const std::vector<int> dateIndex = dateIndexOfRows(rows, dateColumn, weekColumn, facts);
    for (int c = 0; c < static_cast<int>(names.size()); ++c) {
        if (c != dateColumn)
            facts.columns[static_cast<std::size_t>(c)] =
                columnFactsOf(rows, c, dateIndex, facts.datesRepeat());
    }
    return facts;
}

/// "'a', 'b', 'c' and 12 more".
std::string columnList(const std::vector<std::string>& names, const std::vector<int>& columns) {
    std::string out;
    const std::size_t shown = std::min<std::size_t>(columns.size(), 4);
    for (std::size_t i = 0; i < shown; ++i) {
        out += i == 0 ? "" : (i + 1 == columns.size() ? " and " : ", ");
        out += quotedName(names[static_cast<std::size_t>(columns[i])]);
    }
    if (columns.size() > shown)
        out += " and " + std::to_string(columns.size() - shown) + " more";
    return out;
}

/// How much column `c` looks like the region column of a long file (> 0: it can be one).
int regionEvidence(const SampleFacts& facts, int c) {
    const auto i = static_cast<std::size_t>(c);
    const ColumnFacts& k = facts.columns[i];
    const HeaderWords& w = facts.words[i];
    int score = 0;
    if (isCodeColumn(facts.profiles[i]))
        score += 3;  // text or codes with a leading zero
    else if (k.codesInRuns())
        score += 3;  // sorted by region: one code over many rows
    else if (facts.datesRepeat() && k.positiveIntegers && k.keyWithDate &&
             k.distinct * 2 <= k.cells)
        score += 2;  // sorted by date: a few codes, each once per date
    if (w.hints(HeaderRole::Region))
        score += 2;
    if (w.hints(HeaderRole::Count) || w.hints(HeaderRole::Date))
        score -= 3;
    if (w.hints(HeaderRole::Measure))
        score -= 1;
    return score;
}

struct RegionChoice {
    int column = -1;  // the best candidate among the non-date columns (the first on ties)
    int evidence = 0;
};

RegionChoice chooseRegionColumn(const SampleFacts& facts, const std::vector<int>& others) {
    RegionChoice best;
    for (int c : others) {
        const int e = regionEvidence(facts, c);
        if (best.column < 0 || e > best.evidence)
            best = {c, e};
    }
    return best;
}

/// The columns a dates-down reading takes as regions: those named by --value-col, or all.
std::vector<int> datesDownRegionColumns(const std::vector<std::string>& names,
                                        const std::vector<int>& others,
                                        const IngestOptions& options) {
    if (options.valueColumns.empty())
        return others;
    std::vector<int> out;
    for (const std::string& w : options.valueColumns) {
        if (Result<int> c = findColumn(names, w, "--value-col"))
            out.push_back(*c);
    }
    return out.empty() ? others : out;
}

/// Why a dates-down reading cannot be right ("" when it can).
std::string datesDownImpossibility(const std::vector<std::string>& names, bool header,
                                   const SampleFacts& facts, const std::vector<int>& regions) {
    if (!header)
        return "there is no header row to name the regions";
    for (int c : regions) {
        const auto i = static_cast<std::size_t>(c);
        if (facts.words[i].tradeName)
            return "column " + quotedName(names[i]) + " would be a region, but " +
                   quotedName(names[i]) + " is a column name, not a region code";
        if (isCodeColumn(facts.profiles[i]))
            return "column " + quotedName(names[i]) + " would be a region, but it holds codes or " +
                   "text, not counts";
    }
    return {};
}

/// The scores of the two readings of a file with a date column, and what they rest on.
struct LayoutScores {
    double longScore = 0;
    double datesDownScore = 0;
    std::string longReasons;
    std::string datesDownReasons;
};

void addReason(std::string& reasons, const std::string& reason) {
    reasons += (reasons.empty() ? "" : "; ") + reason;
}

LayoutScores scoreLayouts(const std::vector<std::string>& names, const SampleFacts& facts,
                          const std::vector<int>& others, const std::vector<int>& downRegions) {
    LayoutScores s;
    const double repeated = facts.repeatedDateShare();
    if (repeated > 0) {
        s.longScore += kRepeatedDatesWeight * std::min(1.0, 2.0 * repeated);
        addReason(s.longReasons, std::to_string(facts.distinctDates) + " distinct dates in " +
                                     std::to_string(facts.dateCells) + " rows");
    }
    // Region codes in runs: a column of codesInRuns() followed by a column of counts (in a
    // long file the region column comes before the counts; a constant column after the counts
    // is more likely a total or a flag of a dates-down file).
    int inRuns = -1;
    bool countsAfter = false;
    for (int c : others) {
        const auto i = static_cast<std::size_t>(c);
        if (facts.columns[i].codesInRuns()) {
            if (inRuns < 0)
                inRuns = c;
        } else if (inRuns >= 0 && isNumericColumn(facts.profiles[i]) &&
                   facts.columns[i].cells > 0) {
            countsAfter = true;
            break;
        }
    }
    const bool codesInRuns = inRuns >= 0 && countsAfter;
    if (codesInRuns) {
        const ColumnFacts& k = facts.columns[static_cast<std::size_t>(inRuns)];
        s.longScore += kCodesInRunsWeight *
                       std::min(1.0, static_cast<double>(k.longestRun) / kFullWeightRunRows);
        addReason(s.longReasons,
                  "column " + quotedName(names[static_cast<std::size_t>(inRuns)]) + " holds " +
                      std::to_string(k.distinct) + (k.distinct == 1 ? " number" : " numbers") +
                      " in runs, like region codes (" + quotedName(k.longestRunText) + " on " +
                      std::to_string(k.longestRun) + " consecutive rows)");
    }

    if (repeated < kDatesOnceAtMost) {
        s.datesDownScore += kDatesOnceWeight;
        addReason(s.datesDownReasons, "each date once");
        if (!codesInRuns) {
            s.datesDownScore += kVaryLikeCountsWeight;
            addReason(s.datesDownReasons, "the columns vary like counts");
        }
    }
    int digitNames = 0;
    int firstDigitName = -1;
    for (int c : downRegions) {
        if (isDigitName(names[static_cast<std::size_t>(c)])) {
            ++digitNames;
            if (firstDigitName < 0)
                firstDigitName = c;
        }
    }
    if (digitNames > 0) {
        s.datesDownScore +=
            kDigitNamesWeight * digitNames / static_cast<double>(downRegions.size());
        addReason(s.datesDownReasons,
                  "header names such as " +
                      quotedName(names[static_cast<std::size_t>(firstDigitName)]) +
                      " are numbers, like region codes");
    }
    return s;
}

/// Long or dates-down, from the content of the sample (see role_detection.h).
Result<Layout> chooseLayout(const std::vector<std::string>& names, bool header,
                            const SampleFacts& facts, const std::vector<int>& others,
                            const RegionChoice& region, const IngestOptions& options,
                            std::size_t sampleRows) {
    const std::vector<int> downRegions = datesDownRegionColumns(names, others, options);
    const std::string downImpossible = datesDownImpossibility(names, header, facts, downRegions);
    const bool longPossible = region.column >= 0 && region.evidence > 0 && others.size() >= 2;
    const std::string flags =
        "name the layout with --layout long or --layout dates-down, and the columns with "
        "--region-col and --value-col";
    if (!downImpossible.empty() && !longPossible) {
        std::string message = "no layout fits the columns: as dates-down, " + downImpossible +
                              "; as long, no column holds region codes (text, codes such as "
                              "'004', or numbers that repeat in runs)";
        if (others.size() == 1) {
            message +=
                "; a file of one series without a region column can be read with "
                "--layout dates-down (the column's name is then the region)";
        }
        return makeError(ErrorCode::Layout, message + "; " + flags);
    }
    if (!downImpossible.empty())
        return Layout::Long;
    if (!longPossible)
        return Layout::DatesDown;

    const LayoutScores s = scoreLayouts(names, facts, others, downRegions);
    if (std::abs(s.longScore - s.datesDownScore) < kDecisiveMargin) {
        std::vector<int> values;
        for (int c : others) {
            if (c != region.column)
                values.push_back(c);
        }
        const std::string regionName = names[static_cast<std::size_t>(region.column)];
        return makeError(
            ErrorCode::Ambiguous,
            "the first " + std::to_string(sampleRows) + " rows read two ways: as long, column " +
                quotedName(regionName) + " holds the region codes and " +
                columnList(names, values) + " the counts (" +
                (s.longReasons.empty() ? "no other sign" : s.longReasons) + "); as dates-down, " +
                columnList(names, downRegions) + " are regions (" +
                (s.datesDownReasons.empty() ? "no other sign" : s.datesDownReasons) +
                "). Say which with --layout long (the region column can be named with "
                "--region-col " +
                regionName + ") or --layout dates-down");
    }
    return s.longScore > s.datesDownScore ? Layout::Long : Layout::DatesDown;
}

/// A long reading must not take a column name as a region code: a header line repeated in
/// the data, or a header read as data. The error names the first such cell.
Status checkRegionCellsAreNotColumnNames(const std::vector<std::string>& names, bool header,
                                         const std::vector<SampleRecord>& rows,
                                         const SampleFacts& facts, int regionColumn) {
    std::unordered_set<std::string> tradeNames;  // the header's trade names, lower case
    if (header) {
        for (std::size_t c = 0; c < names.size(); ++c) {
            if (facts.words[c].tradeName)
                tradeNames.insert(lowerTrimmed(names[c]));
        }
        if (tradeNames.empty())
            return Ok{};
    }
    std::unordered_set<std::string_view> checked;
    for (const SampleRecord& r : rows) {
        const std::string* f = fieldOf(r, regionColumn);
        if (!f || f->empty() || isDigitName(*f) || !checked.insert(*f).second)
            continue;
        const bool columnName =
            header ? tradeNames.count(lowerTrimmed(*f)) > 0 : headerWordsOf(*f).tradeName;
        if (columnName) {
            Error e = makeError(ErrorCode::Layout,
                                "the region column " +
                                    quotedName(names[static_cast<std::size_t>(regionColumn)]) +
                                    " holds " + quotedName(*f) +
                                    ", a column name, as a region code: is a header line "
                                    "repeated in the file, or is the first line a header "
                                    "(--header)?");
            e.line = r.line;
            e.column = static_cast<std::uint64_t>(regionColumn) + 1;
            return e;
        }
    }
    return Ok{};
}

/// With a year and a week column: neither is the region, the measure or a value column.
Status checkYearAndWeekPlayNoOtherRole(const std::vector<std::string>& names,
                                       const RoleMapping& m) {
    if (!m.yearWeek())
        return Ok{};
    for (int c : {m.dateColumn, m.weekColumn}) {
        if (c == m.regionColumn || c == m.measureColumn ||
            std::count(m.valueColumns.begin(), m.valueColumns.end(), c) > 0) {
            return makeError(ErrorCode::Usage,
                             "column '" + names[static_cast<std::size_t>(c)] +
                                 "' is the year or the week of the date, so it cannot be the "
                                 "region, the measure or a value column");
        }
    }
    return Ok{};
}

// The years a year column holds in the sample, for detection only (the reader then takes any
// four-digit year the calendar has): the years of surveillance data, with a margin.
constexpr int kFirstPlausibleYear = 1900;
constexpr int kLastPlausibleYear = 2100;

/// The columns that look like the year and the week of a date written in two cells (see
/// role_detection.h), trade names first.
struct YearWeekCandidates {
    std::vector<int> years, weeks;
};

YearWeekCandidates yearWeekCandidatesOf(const std::vector<std::string>& names, bool header,
                                        const std::vector<SampleRecord>& rows) {
    YearWeekCandidates out;
    if (!header)
        return out;
    std::vector<int> tradeYears, tradeWeeks;
    for (std::size_t c = 0; c < names.size(); ++c) {
        const HeaderWords w = headerWordsOf(names[c]);
        const bool yearName =
            w.hints(HeaderRole::Year) && !w.hints(HeaderRole::Week) && !w.hints(HeaderRole::Count);
        const bool weekName =
            w.hints(HeaderRole::Week) && !w.hints(HeaderRole::Year) && !w.hints(HeaderRole::Count);
        if (!yearName && !weekName)
            continue;
        int cells = 0, fits = 0;
        for (const SampleRecord& r : rows) {
            const std::string* f = fieldOf(r, static_cast<int>(c));
            if (!f || f->empty())
                continue;
            ++cells;
            if (yearName) {
                const std::optional<int> y = yearOfText(*f);
                fits += y && *y >= kFirstPlausibleYear && *y <= kLastPlausibleYear;
            } else {
                const std::optional<int> n = weekNumberOfText(*f);
                fits += n && *n >= 1 && *n <= 53;
            }
        }
        if (cells == 0 || fits * 2 <= cells)
            continue;  // most cells must fit: a stray one is then reported where it is
        std::vector<int>& list = yearName ? (w.tradeName ? tradeYears : out.years)
                                          : (w.tradeName ? tradeWeeks : out.weeks);
        list.push_back(static_cast<int>(c));
    }
    out.years.insert(out.years.begin(), tradeYears.begin(), tradeYears.end());
    out.weeks.insert(out.weeks.begin(), tradeWeeks.begin(), tradeWeeks.end());
    return out;
}

struct YearWeekColumns {
    int year = -1;
    int week = -1;
    bool found() const { return year >= 0 && week >= 0; }
};

/// The year and week columns: named (--year-col, --week-col), or the first candidates; one
/// named detects the other, and then it must be found.
Result<YearWeekColumns> chooseYearWeekColumns(const std::vector<std::string>& names,
                                              const YearWeekCandidates& candidates,
                                              const IngestOptions& options) {
    const Result<int> year = namedColumn(names, options.yearColumn, "--year-col");
    if (!year)
        return year.error();
    const Result<int> week = namedColumn(names, options.weekColumn, "--week-col");
    if (!week)
        return week.error();
    YearWeekColumns out{*year, *week};
    if (out.year >= 0 && out.year == out.week)
        return makeError(ErrorCode::Usage, "--year-col and --week-col name the same column '" +
                                               names[static_cast<std::size_t>(out.year)] + "'");
    for (int c : candidates.years) {
        if (out.year < 0 && c != out.week)
            out.year = c;
    }
    for (int c : candidates.weeks) {
        if (out.week < 0 && c != out.year)
            out.week = c;
    }
    if (options.yearColumn.empty() && options.weekColumn.empty())
        return out;
    if (out.year < 0)
        return makeError(ErrorCode::Usage,
                         "--week-col names '" + options.weekColumn +
                             "', but no column is named as a year (year, Jahr, année, año, "
                             "anno) with four-digit years in its cells; name it with --year-col");
    if (out.week < 0)
        return makeError(ErrorCode::Usage,
                         "--year-col names '" + options.yearColumn +
                             "', but no column is named as a week (week, Woche, semaine, "
                             "semana, settimana, KW) with week numbers 1 to 53 in its cells; "
                             "name it with --week-col");
    return out;
}

/// No column holds dates, nor a year and a week: what was looked for, and the flags.
Error noDateColumnError(const std::vector<std::string>& names, const YearWeekCandidates& candidates,
                        std::size_t sampleRows) {
    std::string message =
        "no column holds dates (YYYY-MM-DD, YYYYMMDD, D/M/Y, M/D/Y or YYYY-Www) in the first " +
        std::to_string(sampleRows) + " rows";
    if (!candidates.weeks.empty())
        message += "; column " +
                   quotedName(names[static_cast<std::size_t>(candidates.weeks.front())]) +
                   " holds week numbers, but no column holds their year";
    else if (!candidates.years.empty())
        message += "; column " +
                   quotedName(names[static_cast<std::size_t>(candidates.years.front())]) +
                   " holds years, but no column holds week numbers";
    return makeError(ErrorCode::Layout,
                     message +
                         "; name the date column with --date-col, or a year and a week-number "
                         "column with --year-col and --week-col, or use --layout dates-across "
                         "if the dates are in the header");
}

/// The region column of a dates-across file: named by --region-col, or the first column whose
/// header is not a date.
Result<int> datesAcrossRegionColumn(const std::vector<std::string>& names,
                                    const std::vector<int>& headerDates,
                                    const IngestOptions& options) {
    if (!options.regionColumn.empty())
        return findColumn(names, options.regionColumn, "--region-col");
    for (std::size_t c = 0; c < names.size(); ++c) {
        if (std::find(headerDates.begin(), headerDates.end(), static_cast<int>(c)) ==
            headerDates.end())
            return static_cast<int>(c);
    }
    return makeError(ErrorCode::Layout,
                     "every header name is a date, so no column holds the region codes");
}

Result<RoleMapping> mapDatesAcross(const std::vector<std::string>& names, bool header,
                                   const std::vector<int>& headerDates,
                                   const IngestOptions& options) {
    RoleMapping m;
    if (!header)
        return makeError(ErrorCode::Layout,
                         "the dates-across layout needs a header row with the dates");
    if (headerDates.empty()) {
        return makeError(
            ErrorCode::Layout,
            "no header name is a date, so this is not a dates-across file; check --layout");
    }
    m.layout = Layout::DatesAcross;
    const Result<int> region = datesAcrossRegionColumn(names, headerDates, options);
    if (!region)
        return region.error();
    m.regionColumn = *region;
    for (int c : headerDates) {
        if (c != m.regionColumn)
            m.dateColumns.push_back(c);
    }
    m.unusedColumns = unusedColumnsOf(names.size(), m);
    return m;
}

/// The column of dates: named, or detected (-1 when no column holds dates).
Result<int> chooseDateColumn(const std::vector<std::string>& names, bool header,
                             const std::vector<ColumnProfile>& profiles,
                             const IngestOptions& options) {
    if (!options.dateColumn.empty())
        return findColumn(names, options.dateColumn, "--date-col");
    std::vector<int> candidates;
    for (std::size_t c = 0; c < names.size(); ++c) {
        if (isDateColumn(profiles[c]))
            candidates.push_back(static_cast<int>(c));
    }
    if (candidates.empty())
        return -1;
    if (header) {
        for (int c : candidates) {
            if (headerWordsOf(names[static_cast<std::size_t>(c)]).hints(HeaderRole::Date))
                return c;
        }
    }
    return candidates[0];
}

/// The region columns of a dates-down file (its value columns): those --value-col names,
/// or `others`.
Result<std::vector<int>> datesDownValueColumns(const std::vector<std::string>& names,
                                               const std::vector<int>& others,
                                               const IngestOptions& options) {
    if (options.valueColumns.empty())
        return others;
    return namedColumns(names, options.valueColumns, "--value-col");
}

Result<RoleMapping> mapDatesDown(RoleMapping m, const std::vector<std::string>& names, bool header,
                                 const std::vector<int>& others, const IngestOptions& options) {
    m.layout = Layout::DatesDown;
    Result<std::vector<int>> values = datesDownValueColumns(names, others, options);
    if (!values)
        return values.error();
    m.valueColumns = std::move(*values);
    if (!header)
        return makeError(ErrorCode::Layout,
                         "the dates-down layout needs a header row with the region codes");
    if (m.valueColumns.empty())
        return makeError(ErrorCode::Layout, "there is no region column besides the dates");
    if (Status s = checkYearAndWeekPlayNoOtherRole(names, m); !s)
        return s.error();
    m.unusedColumns = unusedColumnsOf(names.size(), m);
    return m;
}

/// The region column of a long file: named by --region-col, or the best candidate, whose cells
/// must not be column names.
Result<int> longRegionColumn(const std::vector<std::string>& names, bool header,
                             const std::vector<SampleRecord>& rows, const SampleFacts& facts,
                             const RegionChoice& region, const IngestOptions& options) {
    if (!options.regionColumn.empty())
        return findColumn(names, options.regionColumn, "--region-col");
    if (region.column < 0) {
        return makeError(ErrorCode::Layout,
                         "there is only a date column; a drop needs region and value columns");
    }
    if (Status s = checkRegionCellsAreNotColumnNames(names, header, rows, facts, region.column); !s)
        return s.error();
    return region.column;
}

/// The measure-name column of a long file: named by --measure-col, or the first column of text
/// named with a measure word (-1: none).
Result<int> longMeasureColumn(const std::vector<std::string>& names, const SampleFacts& facts,
                              const std::vector<int>& others, int regionColumn,
                              const IngestOptions& options) {
    if (!options.measureColumn.empty())
        return findColumn(names, options.measureColumn, "--measure-col");
    for (int c : others) {
        const auto i = static_cast<std::size_t>(c);
        if (c != regionColumn && isCodeColumn(facts.profiles[i]) &&
            facts.words[i].hints(HeaderRole::Measure))
            return c;
    }
    return -1;
}

/// The value columns of a long file: named by --value-col, or the numeric columns and those
/// named with a count word; a single column left over is one whatever it holds.
Result<std::vector<int>> longValueColumns(const std::vector<std::string>& names,
                                          const SampleFacts& facts, const std::vector<int>& others,
                                          const RoleMapping& m, const IngestOptions& options) {
    if (!options.valueColumns.empty())
        return namedColumns(names, options.valueColumns, "--value-col");
    std::vector<int> values;
    std::vector<int> rest;
    for (int c : others) {
        const auto i = static_cast<std::size_t>(c);
        if (c == m.regionColumn || c == m.measureColumn)
            continue;
        rest.push_back(c);
        if (facts.words[i].hints(HeaderRole::Count) || isNumericColumn(facts.profiles[i]))
            values.push_back(c);
    }
    // One column left: it is the value column, whatever its cells hold (they are then reported
    // as unparsable, cell by cell, rather than the column being dropped).
    if (values.empty() && rest.size() == 1)
        return rest;
    return values;
}

/// The roles of a long file fit together: values exist, one with a measure column, and no
/// column plays two roles.
Status checkLongRoles(const std::vector<std::string>& names, const RoleMapping& m) {
    if (m.valueColumns.empty()) {
        return makeError(ErrorCode::Layout,
                         "no column holds counts besides the date and region columns; name the "
                         "value column(s) with --value-col");
    }
    if (m.measureColumn >= 0 && m.valueColumns.size() != 1) {
        return makeError(ErrorCode::Layout,
                         "with a measure-name column ('" +
                             names[static_cast<std::size_t>(m.measureColumn)] +
                             "') there must be exactly one value column; name it with --value-col");
    }
    for (int c : std::vector<int>{m.dateColumn, m.regionColumn, m.measureColumn}) {
        if (c >= 0 && std::count(m.valueColumns.begin(), m.valueColumns.end(), c) > 0) {
            return makeError(
                ErrorCode::Usage,
                "column '" + names[static_cast<std::size_t>(c)] +
                    "' cannot be both a value column and the date, region or measure column");
        }
    }
    if (m.regionColumn == m.dateColumn ||
        (m.measureColumn >= 0 &&
         (m.measureColumn == m.dateColumn || m.measureColumn == m.regionColumn))) {
        return makeError(ErrorCode::Usage,
                         "the date, region and measure columns must be different columns");
    }
    return checkYearAndWeekPlayNoOtherRole(names, m);
}

Result<RoleMapping> mapLong(RoleMapping m, const std::vector<std::string>& names, bool header,
                            const std::vector<SampleRecord>& rows, const SampleFacts& facts,
                            const std::vector<int>& others, const RegionChoice& region,
                            const IngestOptions& options) {
    m.layout = Layout::Long;
    const Result<int> regionColumn = longRegionColumn(names, header, rows, facts, region, options);
    if (!regionColumn)
        return regionColumn.error();
    m.regionColumn = *regionColumn;
    const Result<int> measure = longMeasureColumn(names, facts, others, m.regionColumn, options);
    if (!measure)
        return measure.error();
    m.measureColumn = *measure;
    Result<std::vector<int>> values = longValueColumns(names, facts, others, m, options);
    if (!values)
        return values.error();
    m.valueColumns = std::move(*values);
    if (Status s = checkLongRoles(names, m); !s)
        return s.error();
    m.unusedColumns = unusedColumnsOf(names.size(), m);
    return m;
}

/// The header names that are dates (the dates-across layout); none without a header.
std::vector<int> headerDateColumns(const std::vector<std::string>& names, bool header) {
    std::vector<int> out;
    if (!header)
        return out;
    for (std::size_t c = 0; c < names.size(); ++c) {
        if (dateShapeOf(names[c]) != DateShape::None)
            out.push_back(static_cast<int>(c));
    }
    return out;
}

/// Where a file's dates are: a column of dates, or a year and a week column. A year and a week
/// found beside a column of dates are kept too: they play no other role.
struct DateColumns {
    int date = -1;  // the column of dates, or the year
    int week = -1;  // with a year column: the week
    YearWeekColumns yearWeek;
};

Result<DateColumns> chooseDateColumns(const std::vector<std::string>& names, bool header,
                                      const std::vector<SampleRecord>& rows,
                                      const std::vector<ColumnProfile>& profiles,
                                      const IngestOptions& options) {
    const bool yearWeekNamed = !options.yearColumn.empty() || !options.weekColumn.empty();
    const YearWeekCandidates yearWeekLike = yearWeekCandidatesOf(names, header, rows);
    Result<YearWeekColumns> yearWeek = chooseYearWeekColumns(names, yearWeekLike, options);
    if (!yearWeek)
        return yearWeek.error();
    Result<int> date =
        yearWeekNamed ? Result<int>(-1) : chooseDateColumn(names, header, profiles, options);
    if (!date)
        return date.error();
    if (*date >= 0)
        return DateColumns{*date, -1, *yearWeek};
    if (yearWeek->found())
        return DateColumns{yearWeek->year, yearWeek->week, *yearWeek};
    return noDateColumnError(names, yearWeekLike, rows.size());
}

/// The columns that may hold regions, measures or values: all but the date's (and a year and
/// a week beside it).
std::vector<int> columnsBesideTheDate(std::size_t columns, const DateColumns& date) {
    std::vector<int> out;
    for (int c = 0; c < static_cast<int>(columns); ++c) {
        if (c != date.date &&
            (!date.yearWeek.found() || (c != date.yearWeek.year && c != date.yearWeek.week)))
            out.push_back(c);
    }
    return out;
}

/// Long or dates-down: forced by --layout, long when --region-col or --measure-col is given,
/// else chosen from the sample.
Result<Layout> layoutOf(const std::vector<std::string>& names, bool header,
                        const SampleFacts& facts, const std::vector<int>& others,
                        const RegionChoice& region, const IngestOptions& options,
                        std::size_t sampleRows) {
    if (options.layout)
        return *options.layout;
    if (!options.regionColumn.empty() || !options.measureColumn.empty())
        return Layout::Long;
    if (others.empty()) {
        return makeError(ErrorCode::Layout,
                         "there is only a date column; a drop needs region and value columns");
    }
    return chooseLayout(names, header, facts, others, region, options, sampleRows);
}

}  // namespace

std::string lowerTrimmed(std::string_view s) {
    while (!s.empty() && std::isspace(static_cast<unsigned char>(s.front())))
        s.remove_prefix(1);
    while (!s.empty() && std::isspace(static_cast<unsigned char>(s.back())))
        s.remove_suffix(1);
    std::string out;
    for (char c : s)
        out += static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
    return out;
}

Result<int> findColumn(const std::vector<std::string>& names, const std::string& wanted,
                       const char* flag) {
    for (std::size_t i = 0; i < names.size(); ++i) {
        if (names[i] == wanted)
            return static_cast<int>(i);
    }
    const std::string w = lowerTrimmed(wanted);
    for (std::size_t i = 0; i < names.size(); ++i) {
        if (lowerTrimmed(names[i]) == w)
            return static_cast<int>(i);
    }
    std::string list;
    for (std::size_t i = 0; i < names.size() && i < 30; ++i)
        list += (i ? ", '" : "'") + names[i] + "'";
    if (names.size() > 30)
        list += ", ...";
    return makeError(ErrorCode::Usage, std::string(flag) + " names '" + wanted +
                                           "', but there is no such column; the columns are " +
                                           list);
}

Result<RoleMapping> detectRoles(const std::vector<std::string>& names, bool header,
                                const std::vector<SampleRecord>& rows, const NumberStyle& style,
                                const IngestOptions& options) {
    std::vector<ColumnProfile> profiles = profile(names.size(), rows, style);

    // 1. Two or more dates in the header: dates-across.
    const std::vector<int> headerDates = headerDateColumns(names, header);
    const bool yearWeekNamed = !options.yearColumn.empty() || !options.weekColumn.empty();
    const bool across =
        options.layout ? *options.layout == Layout::DatesAcross
                       : headerDates.size() >= 2 && options.dateColumn.empty() && !yearWeekNamed;
    if (across)
        return mapDatesAcross(names, header, headerDates, options);

    // 2. The date: a column of dates, or else a year and a week column.
    const Result<DateColumns> date = chooseDateColumns(names, header, rows, profiles, options);
    if (!date)
        return date.error();
    RoleMapping m;
    m.dateColumn = date->date;
    m.weekColumn = date->week;

    // 3. What the sample says about the other columns, and the best region column.
    const std::vector<int> others = columnsBesideTheDate(names.size(), *date);
    const SampleFacts facts =
        sampleFactsOf(names, header, rows, std::move(profiles), m.dateColumn, m.weekColumn);
    const RegionChoice region = chooseRegionColumn(facts, others);

    // 4. Long or dates-down, then the roles in that layout.
    const Result<Layout> layout =
        layoutOf(names, header, facts, others, region, options, rows.size());
    if (!layout)
        return layout.error();
    if (*layout == Layout::DatesDown)
        return mapDatesDown(std::move(m), names, header, others, options);
    return mapLong(std::move(m), names, header, rows, facts, others, region, options);
}

}  // namespace siftwave::ingest::detail
