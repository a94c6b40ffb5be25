#include "siftwave/scan/scan_options.h"

#include "scan/finding_kinds.h"

#include <charconv>
#include <cmath>
#include <functional>
#include <sstream>
#include <variant>

namespace siftwave::scan {
namespace {

using ValuePointer = std::variant<bool*, int*, double*>;
using detail::OptionEntry;

// Every kind's options, in the table's order: set() and describeScanOptions() both read them.
std::vector<OptionEntry> optionTable(ScanOptions& o) {
    std::vector<OptionEntry> all;
    for (const detail::FindingKindDescriptor& kind : detail::findingKindTable()) {
        std::vector<OptionEntry> own = kind.options(o);
        all.insert(all.end(), own.begin(), own.end());
    }
    return all;
}

std::string valueText(const ValuePointer& p) {
    std::ostringstream s;
    std::visit(
        [&](auto* v) {
            if constexpr (std::is_same_v<decltype(v), bool*>) {
                s << (*v ? "true" : "false");
            } else {
                s << *v;
            }
        },
        p);
    return s.str();
}

Error usage(std::string message) {
    return makeError(ErrorCode::Usage, std::move(message));
}

Status check(bool condition, const char* name, const char* rule) {
    if (condition)
        return Ok{};
    return usage(std::string("scan option ") + name + " must be " + rule);
}

}  // namespace

Status ScanOptions::validate() const {
    for (const detail::FindingKindDescriptor& kind : detail::findingKindTable()) {
        for (const detail::OptionRule& r : kind.rules(*this)) {
            if (Status s = check(r.ok, r.name, r.rule); !s)
                return s;
        }
    }
    return Ok{};
}

Status ScanOptions::set(std::string_view name, std::string_view value) {
    const ScanOptions before = *this;  // restored when the new value does not validate
    for (const OptionEntry& e : optionTable(*this)) {
        if (name != e.name)
            continue;
        const std::string text(value);
        const std::string bad = "scan option " + std::string(name) + ": cannot read '" + text + "'";
        if (auto* b = std::get_if<bool*>(&e.value)) {
            if (text == "true" || text == "1" || text == "on" || text == "yes") {
                **b = true;
            } else if (text == "false" || text == "0" || text == "off" || text == "no") {
                **b = false;
            } else {
                return usage(bad + " as true or false");
            }
        } else if (auto* i = std::get_if<int*>(&e.value)) {
            int parsed = 0;
            auto [end, ec] = std::from_chars(text.data(), text.data() + text.size(), parsed);
            if (ec != std::errc() || end != text.data() + text.size()) {
                return usage(bad + " as a whole number");
            }
            **i = parsed;
        } else if (auto* d = std::get_if<double*>(&e.value)) {
            double parsed = 0;
            auto [end, ec] = std::from_chars(text.data(), text.data() + text.size(), parsed);
            if (ec != std::errc() || end != text.data() + text.size() || !std::isfinite(parsed)) {
                return usage(bad + " as a number");
            }
            **d = parsed;
        }
        Status valid = validate();
        if (!valid)
            *this = before;
        return valid;
    }
    return usage("unknown scan option '" + std::string(name) +
                 "' (see 'siftwave-cli scan --help' for the names)");
}

std::vector<OptionDescription> describeScanOptions() {
    ScanOptions defaults;
    std::vector<OptionDescription> out;
    for (const OptionEntry& e : optionTable(defaults)) {
        out.push_back({e.name, valueText(e.value), e.help});
    }
    return out;
}

}  // namespace siftwave::scan
