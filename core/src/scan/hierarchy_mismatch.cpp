// hierarchy_mismatch: a parent whose count differs from the sum of its
// children in periods where the parent and all its children in the drop are
// reported (register with parents, --regions FILE).
//
// One finding per parent and measure, from the first to the last mismatched
// period, listing the mismatched periods (at most revision.max_dates_listed) and
// the register children that the drop does not have at all. Evidence counts
// periods (periods_compared, periods_mismatched) and, under the names daily
// data has always used, days_compared and days_mismatched (the days those
// periods cover: the same numbers for daily data).

#include "scan/scan_input.h"

#include <cmath>
#include <optional>

namespace siftwave::scan::detail {

namespace {

// A parent's register children: those the drop has (by index) and those it does not (codes).
struct Children {
    std::vector<std::size_t> inDrop;
    nlohmann::json notInDrop = nlohmann::json::array();
};

// Splits the register children of a region code into those in the drop and those not.
Children childrenOf(const Drop& drop, const std::vector<std::string>& childCodes) {
    Children children;
    for (const std::string& code : childCodes) {
        if (auto c = drop.regionIndex(code)) {
            children.inDrop.push_back(*c);
        } else {
            children.notInDrop.push_back(code);
        }
    }
    return children;
}

// The sum of the children in period t; nullopt when one of them is not reported.
std::optional<double> childrenSum(const Drop& drop, std::size_t m,
                                  const std::vector<std::size_t>& children, std::int32_t t) {
    double sum = 0;
    for (std::size_t c : children) {
        const Cell& child = drop.cell(m, c, t);
        if (!child.reported())
            return std::nullopt;
        sum += child.value;
    }
    return sum;
}

// How a parent and its children compare over the periods of one measure.
struct Comparison {
    std::size_t compared = 0, mismatched = 0;
    double absolute = 0;
    std::int32_t first = -1, last = -1;  // first and last mismatched period
    nlohmann::json dates = nlohmann::json::array();
};

// Compares parent p with the sum of its children in every period where all are reported.
Comparison compareWithChildren(const ScanInput& in, std::size_t p, std::size_t m,
                               const std::vector<std::size_t>& children) {
    const Drop& drop = in.drop;
    const double tolerance = in.options.hierarchyMismatch.tolerance;
    const auto listed = static_cast<std::size_t>(in.options.revision.maxDatesListed);
    Comparison cmp;
    for (std::int32_t t = 0; t < drop.periods(); ++t) {
        const Cell& parent = drop.cell(m, p, t);
        if (!parent.reported())
            continue;
        const std::optional<double> sum = childrenSum(drop, m, children, t);
        if (!sum)
            continue;
        ++cmp.compared;
        const double diff = parent.value - *sum;
        if (std::fabs(diff) <= tolerance)
            continue;
        ++cmp.mismatched;
        cmp.absolute += std::fabs(diff);
        if (cmp.first < 0)
            cmp.first = t;
        cmp.last = t;
        if (cmp.dates.size() < listed) {
            cmp.dates.push_back({{"date", drop.periodStart(t).iso()},
                                 {"parent", parent.value},
                                 {"children_sum", *sum},
                                 {"difference", diff}});
        }
    }
    return cmp;
}

// The finding of a parent and measure with mismatched periods.
Finding mismatchFinding(const ScanInput& in, std::size_t p, std::size_t m, const Children& children,
                        const Comparison& cmp) {
    const Drop& drop = in.drop;
    Finding f = makeFinding(in, FindingKind::HierarchyMismatch, Severity::Warning, p, m);
    f.first = drop.periodStart(cmp.first);
    f.last = drop.periodStart(cmp.last);
    f.impact = cmp.absolute;
    nlohmann::json childList = nlohmann::json::array();
    for (std::size_t c : children.inDrop)
        childList.push_back(drop.regionCodes[c]);
    f.evidence = {{"children", childList},
                  {"children_not_in_drop", children.notInDrop},
                  {"days_compared", in.daysIn(static_cast<std::int64_t>(cmp.compared))},
                  {"days_mismatched", in.daysIn(static_cast<std::int64_t>(cmp.mismatched))},
                  {"periods_compared", cmp.compared},
                  {"periods_mismatched", cmp.mismatched},
                  {"absolute_difference", cmp.absolute},
                  {"dates", cmp.dates}};
    suggestAccept(f,
                  "decide which level to trust before summing regions; "
                  "report the parent or the sum of its children, not both");
    return f;
}

}  // namespace

void findHierarchyMismatches(const ScanInput& in, std::vector<Finding>& out) {
    const Drop& drop = in.drop;
    const RegionRegister* reg = in.context.regions;
    if (reg == nullptr || !reg->hasHierarchy())
        return;
    for (std::size_t p = 0; p < drop.regionCodes.size(); ++p) {
        const std::vector<std::string> childCodes = reg->childrenOf(drop.regionCodes[p]);
        if (childCodes.empty())
            continue;
        const Children children = childrenOf(drop, childCodes);
        if (children.inDrop.empty())
            continue;
        for (std::size_t m = 0; m < drop.measures.size(); ++m) {
            const Comparison cmp = compareWithChildren(in, p, m, children.inDrop);
            if (cmp.mismatched > 0)
                out.push_back(mismatchFinding(in, p, m, children, cmp));
        }
    }
}

}  // namespace siftwave::scan::detail
