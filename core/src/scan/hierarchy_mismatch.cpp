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

namespace siftwave::scan::detail {

void findHierarchyMismatches(const ScanInput& in, std::vector<Finding>& out) {
    const Drop& drop = in.drop;
    const RegionRegister* reg = in.context.regions;
    if (reg == nullptr || !reg->hasHierarchy())
        return;
    const double tolerance = in.options.hierarchyMismatch.tolerance;
    const auto listed = static_cast<std::size_t>(in.options.revision.maxDatesListed);
    for (std::size_t p = 0; p < drop.regionCodes.size(); ++p) {
        const std::vector<std::string> childCodes = reg->childrenOf(drop.regionCodes[p]);
        if (childCodes.empty())
            continue;
        std::vector<std::size_t> children;
        nlohmann::json notInDrop = nlohmann::json::array();
        for (const std::string& code : childCodes) {
            if (auto c = drop.regionIndex(code)) {
                children.push_back(*c);
            } else {
                notInDrop.push_back(code);
            }
        }
        if (children.empty())
            continue;
        for (std::size_t m = 0; m < drop.measures.size(); ++m) {
            std::size_t compared = 0, mismatched = 0;
            double absolute = 0;
            std::int32_t first = -1, last = -1;
            nlohmann::json dates = nlohmann::json::array();
            for (std::int32_t t = 0; t < drop.periods(); ++t) {
                const Cell& parent = drop.cell(m, p, t);
                if (!parent.reported())
                    continue;
                double sum = 0;
                bool all = true;
                for (std::size_t c : children) {
                    const Cell& child = drop.cell(m, c, t);
                    if (!child.reported()) {
                        all = false;
                        break;
                    }
                    sum += child.value;
                }
                if (!all)
                    continue;
                ++compared;
                const double diff = parent.value - sum;
                if (std::fabs(diff) <= tolerance)
                    continue;
                ++mismatched;
                absolute += std::fabs(diff);
                if (first < 0)
                    first = t;
                last = t;
                if (dates.size() < listed) {
                    dates.push_back({{"date", drop.periodStart(t).iso()},
                                     {"parent", parent.value},
                                     {"children_sum", sum},
                                     {"difference", diff}});
                }
            }
            if (mismatched == 0)
                continue;
            Finding f = makeFinding(in, FindingKind::HierarchyMismatch, Severity::Warning, p, m);
            f.first = drop.periodStart(first);
            f.last = drop.periodStart(last);
            f.impact = absolute;
            nlohmann::json childList = nlohmann::json::array();
            for (std::size_t c : children)
                childList.push_back(drop.regionCodes[c]);
            f.evidence = {{"children", childList},
                          {"children_not_in_drop", notInDrop},
                          {"days_compared", in.daysIn(static_cast<std::int64_t>(compared))},
                          {"days_mismatched", in.daysIn(static_cast<std::int64_t>(mismatched))},
                          {"periods_compared", compared},
                          {"periods_mismatched", mismatched},
                          {"absolute_difference", absolute},
                          {"dates", dates}};
            suggestAccept(f,
                          "decide which level to trust before summing regions; "
                          "report the parent or the sum of its children, not both");
            out.push_back(std::move(f));
        }
    }
}

}  // namespace siftwave::scan::detail
