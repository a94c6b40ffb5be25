// The finding kind table (core/src/scan/finding_kinds.h): one entry per kind, in order.

#include "scan/finding_kinds.h"

#include <gtest/gtest.h>

#include <set>
#include <string>

namespace siftwave::scan::detail {
namespace {

TEST(FindingKindTable, HoldsEveryKindOnceInEnumOrder) {
    ASSERT_EQ(findingKindTable().size(), std::size(kAllFindingKinds));
    std::set<std::string> names;
    for (FindingKind kind : kAllFindingKinds) {
        EXPECT_EQ(descriptorOf(kind).kind, kind);
        EXPECT_TRUE(names.insert(descriptorOf(kind).name).second) << descriptorOf(kind).name;
        EXPECT_EQ(findingKindFromName(findingKindName(kind)), kind);
    }
}

TEST(FindingKindTable, EachKindOwnsItsOptionsAndTheirEnabledSwitch) {
    ScanOptions options;
    for (const FindingKindDescriptor& kind : findingKindTable()) {
        const std::string prefix = std::string(kind.name) + ".";
        bool hasEnabled = false;
        for (const OptionEntry& e : kind.options(options)) {
            EXPECT_EQ(std::string(e.name).rfind(prefix, 0), 0u) << e.name;
            hasEnabled = hasEnabled || std::string(e.name) == prefix + "enabled";
        }
        EXPECT_TRUE(hasEnabled) << kind.name;
        EXPECT_TRUE(kind.enabled(options)) << kind.name;
        ASSERT_TRUE(options.set(prefix + "enabled", "false").ok());
        EXPECT_FALSE(kind.enabled(options)) << kind.name;
        for (const OptionRule& r : kind.rules(ScanOptions{}))
            EXPECT_TRUE(r.ok) << r.name;  // the defaults keep every rule
    }
}

TEST(FindingKindTable, KindsThatCompareNameTheirInput) {
    EXPECT_EQ(descriptorOf(FindingKind::Revision).needs, unsigned(kNeedsPrevious));
    EXPECT_EQ(descriptorOf(FindingKind::UnknownCode).needs, unsigned(kNeedsRegister));
    EXPECT_EQ(descriptorOf(FindingKind::HierarchyMismatch).needs, unsigned(kNeedsRegister));
    EXPECT_EQ(descriptorOf(FindingKind::BacklogDump).needs, unsigned(kNeedsDropOnly));
}

}  // namespace
}  // namespace siftwave::scan::detail
