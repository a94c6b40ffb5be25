#include "support/synthetic_drop.h"

#include <algorithm>
#include <cassert>
#include <cmath>
#include <cstdio>
#include <random>

namespace siftwave::testing {
namespace {

std::int32_t drawNegBin(std::mt19937_64& rng, double mean, double size) {
    if (!(mean > 0))
        return 0;
    std::gamma_distribution<double> gamma(size, mean / size);
    const double lambda = gamma(rng);
    if (!(lambda > 0))
        return 0;
    std::poisson_distribution<std::int32_t> poisson(lambda);
    return poisson(rng);
}

void renumberLines(Drop& drop) {
    std::uint32_t line = 2;  // line 1 is the header
    for (std::int32_t t = 0; t < drop.periods(); ++t) {
        for (std::size_t r = 0; r < drop.regionCodes.size(); ++r) {
            bool row = false;
            for (CellTable& table : drop.tables) {
                row = row || table.at(r, static_cast<std::size_t>(t)).state != CellState::Absent;
            }
            if (!row)
                continue;
            for (CellTable& table : drop.tables) {
                Cell& c = table.at(r, static_cast<std::size_t>(t));
                c.line = line;
                if (c.state == CellState::Absent)
                    c.state = CellState::Blank;  // row exists
            }
            ++line;
        }
    }
}

}  // namespace

SyntheticDrop makeSyntheticDrop(const SyntheticOptions& o) {
    std::mt19937_64 rng(o.seed);
    std::uniform_real_distribution<double> unit(0.0, 1.0);
    SyntheticDrop s;
    Drop& drop = s.drop;
    drop.source.path = "synthetic-seed-" + std::to_string(o.seed) + ".csv";
    const bool weekly = o.weeks > 0;
    const int periods = weekly ? o.weeks : o.days;
    drop.axis = weekly ? TimeAxis::weekly(*Date::fromIso(o.firstDay), periods, WeekStart::Monday)
                       : TimeAxis::daily(*Date::fromIso(o.firstDay), periods);
    drop.measures = {"cases"};
    if (o.deaths)
        drop.measures.push_back("deaths");
    for (int r = 0; r < o.regions; ++r) {
        char code[16];
        std::snprintf(code, sizeof code, "K%02d", r + 1);
        drop.regionCodes.push_back(code);
    }
    drop.indexRegions();
    for (std::size_t m = 0; m < drop.measures.size(); ++m) {
        drop.tables.emplace_back(static_cast<std::size_t>(o.regions),
                                 static_cast<std::size_t>(periods));
    }

    struct Wave {
        double centre, width, height;
    };
    std::vector<Wave> waves;
    for (int k = 0; k < o.waves; ++k) {
        const double slot = static_cast<double>(periods) / o.waves;
        const double centre = slot * (k + 0.3 + 0.4 * unit(rng));
        const double u = unit(rng);
        const double width = weekly ? 2.5 + 3.5 * u : 8 + 14 * u;
        waves.push_back({centre, width, 0.5 + 0.5 * unit(rng)});
    }
    const int firstWeekday = drop.axis.first().isoWeekday() - 1;
    s.mean.assign(static_cast<std::size_t>(o.regions) * static_cast<std::size_t>(periods), 0.0);
    for (int r = 0; r < o.regions; ++r) {
        const double scale = o.minPeak * std::pow(o.maxPeak / o.minPeak, unit(rng));
        const double delay = (-10 + 20 * unit(rng)) / drop.axis.periodDays();
        for (int t = 0; t < periods; ++t) {
            double shape = o.floorShare;
            for (const Wave& w : waves) {
                const double z = (t - w.centre - delay) / w.width;
                shape += w.height * std::exp(-0.5 * z * z);
            }
            const double mu =
                scale * shape *
                (weekly ? 1.0 : o.weekday[static_cast<std::size_t>((firstWeekday + t) % 7)]);
            s.mean[static_cast<std::size_t>(r) * static_cast<std::size_t>(periods) +
                   static_cast<std::size_t>(t)] = mu;
            const std::size_t ru = static_cast<std::size_t>(r), tu = static_cast<std::size_t>(t);
            Cell& c = drop.tables[0].at(ru, tu);
            c.state = CellState::Reported;
            c.value = drawNegBin(rng, mu, o.size);
            if (o.deaths) {
                Cell& d = drop.tables[1].at(ru, tu);
                d.state = CellState::Reported;
                d.value = drawNegBin(rng, 0.01 * mu, o.size);
            }
        }
    }
    drop.rows = static_cast<std::size_t>(o.regions) * static_cast<std::size_t>(periods);
    renumberLines(drop);
    return s;
}

void plantBacklogDump(SyntheticDrop& s, std::size_t region, std::int32_t day, int heldDays,
                      double share) {
    CellTable& table = s.drop.tables[0];
    std::int64_t moved = 0;
    for (std::int32_t t = std::max(0, day - heldDays); t < day; ++t) {
        Cell& c = table.at(region, static_cast<std::size_t>(t));
        const auto held = static_cast<std::int32_t>(std::floor(c.value * share));
        c.value -= held;
        moved += held;
    }
    table.at(region, static_cast<std::size_t>(day)).value += static_cast<std::int32_t>(moved);
    s.planted.push_back({"backlog_dump", region, day, day, moved});
}

void plantReportingGap(SyntheticDrop& s, std::size_t region, std::int32_t first, int days) {
    CellTable& table = s.drop.tables[0];
    std::int64_t moved = 0;
    for (std::int32_t t = first; t < first + days; ++t) {
        Cell& c = table.at(region, static_cast<std::size_t>(t));
        moved += c.value;
        c.value = 0;
    }
    const std::int32_t after = first + days;
    table.at(region, static_cast<std::size_t>(after)).value += static_cast<std::int32_t>(moved);
    s.planted.push_back({"reporting_gap", region, first, first + days - 1, moved});
    s.planted.push_back({"backlog_dump", region, after, after, moved});
}

void plantMissingDates(SyntheticDrop& s, std::size_t region, std::int32_t first, int days) {
    for (CellTable& table : s.drop.tables) {
        for (std::int32_t t = first; t < first + days; ++t) {
            table.at(region, static_cast<std::size_t>(t)) = Cell{};
        }
    }
    s.drop.rows -= static_cast<std::size_t>(days);
    renumberLines(s.drop);
    s.planted.push_back({"missing_dates", region, first, first + days - 1, days});
}

void plantNegative(SyntheticDrop& s, std::size_t region, std::int32_t day, std::int32_t value) {
    s.drop.tables[0].at(region, static_cast<std::size_t>(day)).value = value;
    s.planted.push_back({"negative_count", region, day, day, value});
}

void plantDuplicate(SyntheticDrop& s, std::size_t region, std::int32_t day,
                    std::int32_t differentValue) {
    const Cell& kept = s.drop.tables[0].at(region, static_cast<std::size_t>(day));
    DuplicateRow d;
    d.measure = 0;
    d.region = region;
    d.day = day;
    d.cell = kept;
    d.cell.value = differentValue != 0 ? differentValue : kept.value;
    d.cell.line = static_cast<std::uint32_t>(s.drop.rows + 2);  // appended after the last row
    d.firstLine = kept.line;
    s.drop.duplicates.push_back(d);
    ++s.drop.rows;
    s.planted.push_back({"duplicate_row", region, day, day, d.cell.value});
}

void plantStaleValues(SyntheticDrop& s, std::size_t region, std::int32_t first, int days) {
    CellTable& table = s.drop.tables[0];
    const std::int32_t value = table.at(region, static_cast<std::size_t>(first)).value;
    for (std::int32_t t = first + 1; t < first + days; ++t) {
        table.at(region, static_cast<std::size_t>(t)).value = value;
    }
    // Keep the run exactly as long as planted: the days before and after must differ.
    if (first > 0 && table.at(region, static_cast<std::size_t>(first) - 1).value == value) {
        table.at(region, static_cast<std::size_t>(first) - 1).value += value > 0 ? -1 : 1;
    }
    const std::int32_t after = first + days;
    if (after < s.drop.periods() &&
        table.at(region, static_cast<std::size_t>(after)).value == value) {
        table.at(region, static_cast<std::size_t>(after)).value += 1;
    }
    s.planted.push_back({"stale_values", region, first, first + days - 1, value});
}

Drop handBuiltDrop(const std::vector<std::string>& codes,
                   const std::vector<std::vector<std::int32_t>>& series,
                   const std::string& firstDay, const std::string& measure) {
    return handBuiltDrop(codes, {measure}, {series}, firstDay);
}

Drop handBuiltDrop(const std::vector<std::string>& codes, const std::vector<std::string>& measures,
                   const std::vector<std::vector<std::vector<std::int32_t>>>& series,
                   const std::string& firstDay) {
    Drop drop;
    drop.source.path = "hand-built.csv";
    drop.regionCodes = codes;
    drop.indexRegions();
    drop.measures = measures;
    drop.axis = TimeAxis::daily(
        *Date::fromIso(firstDay),
        series.empty() || series[0].empty() ? 0 : static_cast<std::int32_t>(series[0][0].size()));
    for (std::size_t m = 0; m < measures.size(); ++m) {
        assert(series[m].size() == codes.size());
        CellTable table(codes.size(), static_cast<std::size_t>(drop.periods()));
        for (std::size_t r = 0; r < codes.size(); ++r) {
            assert(series[m][r].size() == static_cast<std::size_t>(drop.periods()));
            for (std::int32_t t = 0; t < drop.periods(); ++t) {
                const std::int32_t v = series[m][r][static_cast<std::size_t>(t)];
                Cell& c = table.at(r, static_cast<std::size_t>(t));
                if (v == kNoRow)
                    continue;
                if (v == kBlank) {
                    c.state = CellState::Blank;
                } else {
                    c.state = CellState::Reported;
                    c.value = v;
                }
            }
        }
        drop.tables.push_back(std::move(table));
    }
    renumberLines(drop);
    for (std::int32_t t = 0; t < drop.periods(); ++t) {
        for (std::size_t r = 0; r < codes.size(); ++r) {
            drop.rows +=
                drop.tables[0].at(r, static_cast<std::size_t>(t)).state != CellState::Absent;
        }
    }
    return drop;
}

Drop handBuiltWeeklyDrop(const std::vector<std::string>& codes,
                         const std::vector<std::vector<std::int32_t>>& series,
                         const std::string& firstMonday, const std::string& measure) {
    Drop drop = handBuiltDrop(codes, series, firstMonday, measure);
    drop.axis = TimeAxis::weekly(*Date::fromIso(firstMonday), drop.periods(), WeekStart::Monday);
    return drop;
}

std::string toLongCsv(const Drop& drop) {
    std::string out = "date,region";
    for (const std::string& m : drop.measures)
        out += "," + m;
    out += "\n";
    out.reserve(static_cast<std::size_t>(drop.periods()) * drop.regionCodes.size() * 24);
    char number[16];
    for (std::int32_t t = 0; t < drop.periods(); ++t) {
        const std::string date = drop.periodStart(t).iso();
        for (std::size_t r = 0; r < drop.regionCodes.size(); ++r) {
            bool row = false;
            for (std::size_t m = 0; m < drop.measures.size(); ++m) {
                row = row || drop.cell(m, r, t).state != CellState::Absent;
            }
            if (!row)
                continue;
            out += date;
            out += ',';
            out += drop.regionCodes[r];
            for (std::size_t m = 0; m < drop.measures.size(); ++m) {
                out += ',';
                const Cell& c = drop.cell(m, r, t);
                if (c.reported()) {
                    std::snprintf(number, sizeof number, "%d", c.value);
                    out += number;
                }
            }
            out += '\n';
        }
    }
    return out;
}

}  // namespace siftwave::testing
