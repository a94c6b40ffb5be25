#include "ingest/warning_log.h"

namespace siftwave::ingest::detail {

void WarningLog::add(const std::string& kind, std::string message, std::uint64_t line,
                     std::uint64_t column) {
    std::size_t& listed = m_listedPerKind[kind];
    if (listed < kPerKindLimit) {
        ++listed;
        m_listed.push_back({std::move(message), line, column});
        return;
    }
    Tally& t = m_overflow[kind];
    if (t.total++ == 0) {
        t.line = line;
        t.column = column;
    }
}

void WarningLog::count(const std::string& kind, std::uint64_t line, std::uint64_t column,
                       std::string example) {
    auto [it, added] = m_counted.try_emplace(kind);
    if (added) {
        m_countedOrder.push_back(kind);
        it->second.line = line;
        it->second.column = column;
        it->second.example = std::move(example);
    }
    ++it->second.total;
}

void WarningLog::moveTo(std::vector<Warning>& out, const Provenance& source,
                        const std::map<std::string, std::string>& countedPhrases) {
    for (const std::string& kind : m_countedOrder) {
        const Tally& t = m_counted[kind];
        auto phrase = countedPhrases.find(kind);
        std::string message = std::to_string(t.total) + " " +
                              (phrase == countedPhrases.end() ? kind : phrase->second);
        if (!t.example.empty())
            message += " (first: '" + t.example + "')";
        out.push_back({message, t.line, t.column});
    }
    for (Warning& w : m_listed)
        out.push_back(std::move(w));
    for (const auto& [kind, t] : m_overflow) {
        std::string message = "... and " + std::to_string(t.total) + " more like the above (";
        message += kind;
        message += "), the first at ";
        message += sourcePlace(source, t.line);
        out.push_back({std::move(message), t.line, t.column});
    }
    m_listed.clear();
}

}  // namespace siftwave::ingest::detail
