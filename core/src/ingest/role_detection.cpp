#include "ingest/role_detection.h"

#include "ingest/date_parsing.h"

#include <algorithm>
#include <cctype>
#include <set>

namespace siftwave::detail {
namespace {

bool nameHasAny(const std::string& name, std::initializer_list<const char*> words) {
    const std::string n = lowerTrimmed(name);
    for (const char* w : words) {
        if (n.find(w) != std::string::npos)
            return true;
    }
    return false;
}

struct ColumnProfile {
    int empty = 0, integer = 0, decimal = 0, leadingZero = 0, date = 0, text = 0;
    int nonEmpty() const { return integer + decimal + leadingZero + date + text; }
    DateShape dateShape = DateShape::None;
    bool mixedDateShapes = false;
    bool allCompactDates = true;  // every non-empty cell is 8 digits forming a real YYYYMMDD day
};

std::vector<ColumnProfile> profile(std::size_t columns, const std::vector<SampleRecord>& rows,
                                   const NumberStyle& style) {
    std::vector<ColumnProfile> out(columns);
    for (const SampleRecord& r : rows) {
        for (std::size_t c = 0; c < columns && c < r.fields.size(); ++c) {
            const std::string& f = r.fields[c];
            ColumnProfile& p = out[c];
            switch (shapeOf(f, style)) {
                case CellShape::Empty:
                    ++p.empty;
                    break;
                case CellShape::Integer:
                    ++p.integer;
                    break;
                case CellShape::Decimal:
                    ++p.decimal;
                    break;
                case CellShape::LeadingZero:
                    ++p.leadingZero;
                    break;
                case CellShape::Date:
                    ++p.date;
                    break;
                case CellShape::Text:
                    ++p.text;
                    break;
            }
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
    if (p.date * 2 > p.nonEmpty())
        return true;
    return p.allCompactDates && p.integer + p.leadingZero == p.nonEmpty();
}

bool isNumericColumn(const ColumnProfile& p) {
    const int numbers = p.integer + p.decimal;
    return p.nonEmpty() == 0 || numbers * 2 >= p.nonEmpty();
}

bool isCodeColumn(const ColumnProfile& p) {
    return p.nonEmpty() > 0 && (p.text + p.leadingZero) * 2 > p.nonEmpty();
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

/// The columns that play no role in `m`, in column order.
std::vector<int> unusedColumnsOf(std::size_t columns, const RoleMapping& m) {
    auto in = [](const std::vector<int>& list, int c) {
        return std::find(list.begin(), list.end(), c) != list.end();
    };
    std::vector<int> out;
    for (int c = 0; c < static_cast<int>(columns); ++c) {
        if (c != m.dateColumn && c != m.regionColumn && c != m.measureColumn &&
            !in(m.valueColumns, c) && !in(m.dateColumns, c))
            out.push_back(c);
    }
    return out;
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
    RoleMapping m;
    const std::size_t columns = names.size();
    std::vector<ColumnProfile> profiles = profile(columns, rows, style);

    // Dates in the header: dates-across.
    std::vector<int> headerDates;
    if (header) {
        for (std::size_t c = 0; c < columns; ++c) {
            if (dateShapeOf(names[c]) != DateShape::None)
                headerDates.push_back(static_cast<int>(c));
        }
    }
    const bool across = options.layout ? *options.layout == Layout::DatesAcross
                                       : headerDates.size() >= 2 && options.dateColumn.empty();
    if (across) {
        if (!header)
            return makeError(ErrorCode::Layout,
                             "the dates-across layout needs a header row with the dates");
        if (headerDates.empty()) {
            return makeError(
                ErrorCode::Layout,
                "no header name is a date, so this is not a dates-across file; check --layout");
        }
        m.layout = Layout::DatesAcross;
        if (!options.regionColumn.empty()) {
            Result<int> r = findColumn(names, options.regionColumn, "--region-col");
            if (!r)
                return r.error();
            m.regionColumn = *r;
        } else {
            for (std::size_t c = 0; c < columns; ++c) {
                if (std::find(headerDates.begin(), headerDates.end(), static_cast<int>(c)) ==
                    headerDates.end()) {
                    m.regionColumn = static_cast<int>(c);
                    break;
                }
            }
            if (m.regionColumn < 0) {
                return makeError(
                    ErrorCode::Layout,
                    "every header name is a date, so no column holds the region codes");
            }
        }
        for (int c : headerDates) {
            if (c != m.regionColumn)
                m.dateColumns.push_back(c);
        }
        m.unusedColumns = unusedColumnsOf(columns, m);
        return m;
    }

    // The date column.
    if (!options.dateColumn.empty()) {
        Result<int> d = findColumn(names, options.dateColumn, "--date-col");
        if (!d)
            return d.error();
        m.dateColumn = *d;
    } else {
        std::vector<int> candidates;
        for (std::size_t c = 0; c < columns; ++c) {
            if (isDateColumn(profiles[c]))
                candidates.push_back(static_cast<int>(c));
        }
        if (candidates.empty()) {
            return makeError(
                ErrorCode::Layout,
                "no column holds dates (YYYY-MM-DD, YYYYMMDD, D/M/Y or M/D/Y) in the first " +
                    std::to_string(rows.size()) +
                    " rows; name the date column with --date-col, or use --layout dates-across if "
                    "the "
                    "dates are in the header");
        }
        m.dateColumn = candidates[0];
        for (int c : candidates) {
            if (nameHasAny(names[static_cast<std::size_t>(c)], {"date", "day"})) {
                m.dateColumn = c;
                break;
            }
        }
    }

    std::vector<int> others;
    for (std::size_t c = 0; c < columns; ++c) {
        if (static_cast<int>(c) != m.dateColumn)
            others.push_back(static_cast<int>(c));
    }
    bool datesRepeat = false;
    {
        std::set<std::string> seen;
        for (const SampleRecord& r : rows) {
            if (static_cast<std::size_t>(m.dateColumn) < r.fields.size() &&
                !seen.insert(r.fields[static_cast<std::size_t>(m.dateColumn)]).second) {
                datesRepeat = true;
                break;
            }
        }
    }
    std::vector<int> codeColumns;
    for (int c : others) {
        if (isCodeColumn(profiles[static_cast<std::size_t>(c)]))
            codeColumns.push_back(c);
    }

    Layout layout;
    if (options.layout)
        layout = *options.layout;
    else if (!options.regionColumn.empty() || !options.measureColumn.empty() ||
             !codeColumns.empty() || datesRepeat)
        layout = Layout::Long;
    else
        layout = Layout::DatesDown;
    m.layout = layout;

    if (layout == Layout::DatesDown) {
        if (!options.valueColumns.empty()) {
            Result<std::vector<int>> named =
                namedColumns(names, options.valueColumns, "--value-col");
            if (!named)
                return named.error();
            m.valueColumns = std::move(*named);
        } else {
            m.valueColumns = others;
        }
        if (!header)
            return makeError(ErrorCode::Layout,
                             "the dates-down layout needs a header row with the region codes");
        if (m.valueColumns.empty())
            return makeError(ErrorCode::Layout, "there is no region column besides the dates");
        m.unusedColumns = unusedColumnsOf(columns, m);
        return m;
    }

    // Long: region, optional measure names, values.
    if (!options.regionColumn.empty()) {
        Result<int> r = findColumn(names, options.regionColumn, "--region-col");
        if (!r)
            return r.error();
        m.regionColumn = *r;
    } else {
        const std::initializer_list<const char*> regionWords = {
            "region",  "code",     "area", "district", "province", "county",  "state",
            "country", "location", "geo",  "iso",      "zone",     "municip", "place"};
        for (int c : codeColumns.empty() ? others : codeColumns) {
            if (header && nameHasAny(names[static_cast<std::size_t>(c)], regionWords)) {
                m.regionColumn = c;
                break;
            }
        }
        if (m.regionColumn < 0 && !codeColumns.empty())
            m.regionColumn = codeColumns[0];
        if (m.regionColumn < 0 && !others.empty())
            m.regionColumn = others[0];
        if (m.regionColumn < 0) {
            return makeError(ErrorCode::Layout,
                             "there is only a date column; a drop needs region and value columns");
        }
    }
    if (!options.measureColumn.empty()) {
        Result<int> r = findColumn(names, options.measureColumn, "--measure-col");
        if (!r)
            return r.error();
        m.measureColumn = *r;
    } else if (header) {
        for (int c : codeColumns) {
            if (c != m.regionColumn &&
                nameHasAny(names[static_cast<std::size_t>(c)],
                           {"measure", "indicator", "variable", "metric", "outcome"})) {
                m.measureColumn = c;
                break;
            }
        }
    }
    if (!options.valueColumns.empty()) {
        Result<std::vector<int>> named = namedColumns(names, options.valueColumns, "--value-col");
        if (!named)
            return named.error();
        m.valueColumns = std::move(*named);
    } else {
        for (int c : others) {
            if (c == m.regionColumn || c == m.measureColumn)
                continue;
            const bool countName =
                header && nameHasAny(names[static_cast<std::size_t>(c)],
                                     {"case", "death", "count", "value", "number", "total",
                                      "confirmed", "hospital", "admission", "test", "positive"});
            if (countName || isNumericColumn(profiles[static_cast<std::size_t>(c)]))
                m.valueColumns.push_back(c);
        }
    }
    if (m.valueColumns.empty()) {
        // One column left: it is the value column, whatever its cells hold (they are
        // then reported as unparsable, cell by cell, rather than the column being dropped).
        std::vector<int> rest;
        for (int c : others)
            if (c != m.regionColumn && c != m.measureColumn)
                rest.push_back(c);
        if (rest.size() == 1)
            m.valueColumns = rest;
    }
    if (m.valueColumns.empty()) {
        return makeError(ErrorCode::Layout,
                         "no column holds counts besides the date and region columns; name the "
                         "value column(s) with "
                         "--value-col");
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
    m.unusedColumns = unusedColumnsOf(columns, m);
    return m;
}

}  // namespace siftwave::detail
