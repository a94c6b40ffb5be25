#include "siftwave/ledger/anchor.h"

#include <algorithm>
#include <cctype>

namespace siftwave::ledger {
namespace {

bool isHexDigit(char c) {
    return std::isxdigit(static_cast<unsigned char>(c)) != 0;
}

std::string lowered(std::string_view text) {
    std::string out(text);
    std::transform(out.begin(), out.end(), out.begin(),
                   [](unsigned char c) { return static_cast<char>(std::tolower(c)); });
    return out;
}

bool startsWith(const std::string& hash, const std::string& prefix) {
    return hash.compare(0, prefix.size(), prefix) == 0;
}

}  // namespace

Result<AnchorCheck> checkAnchor(const Ledger& ledger, std::string_view head) {
    if (head.size() < kMinAnchorDigits || head.size() > 64 ||
        !std::all_of(head.begin(), head.end(), isHexDigit)) {
        return makeError(ErrorCode::Usage,
                         "a recorded head is " + std::to_string(kMinAnchorDigits) +
                             " to 64 hex digits (as a figure, a report or ledger --verify printed "
                             "it); got \"" +
                             std::string(head.substr(0, 80)) + "\"");
    }
    AnchorCheck check;
    check.recorded = lowered(head);
    const std::uint64_t count = ledger.entries.size();
    // The empty ledger's head is the genesis hash (64 zeros).
    if (startsWith(genesisHash(), check.recorded)) {
        check.outcome = count == 0 ? AnchorOutcome::AtHead : AnchorOutcome::Extended;
        check.unanchored = count;
        return check;
    }
    // Newest first: a later match is the recorded head (an earlier one would be a
    // prefix collision, which kMinAnchorDigits makes impractical to arrange).
    for (std::uint64_t k = count; k >= 1; --k) {
        if (startsWith(ledger.entries[k - 1].hash, check.recorded)) {
            check.entry = k;
            check.unanchored = count - k;
            check.outcome = k == count ? AnchorOutcome::AtHead : AnchorOutcome::Extended;
            return check;
        }
    }
    check.outcome = AnchorOutcome::Missing;
    return check;
}

const char* AnchorCheck::outcomeName() const {
    switch (outcome) {
        case AnchorOutcome::AtHead:
            return "at_head";
        case AnchorOutcome::Extended:
            return "extended";
        case AnchorOutcome::Missing:
            break;
    }
    return "missing";
}

std::string AnchorCheck::describe() const {
    const std::string head = recorded.substr(0, kMinAnchorDigits);
    switch (outcome) {
        case AnchorOutcome::AtHead:
            return "the recorded head " + head + " is the last entry (" + std::to_string(entry) +
                   "): no entry was changed, removed, reordered or added since it was recorded";
        case AnchorOutcome::Extended:
            return "the recorded head " + head + " is entry " + std::to_string(entry) +
                   ": entries 1 to " + std::to_string(entry) + " are unchanged; " +
                   std::to_string(unanchored) + (unanchored == 1 ? " entry was" : " entries were") +
                   " added after it, which this head does not cover";
        case AnchorOutcome::Missing:
            break;
    }
    return "no entry has the recorded head " + head +
           ": the ledger is not the one that head was recorded from. An entry up to it was "
           "edited, removed, inserted or reordered and the hashes recomputed, or entries were "
           "cut from the end";
}

std::string printedHead(const Ledger& ledger) {
    return ledger.headHash().substr(0, kMinAnchorDigits);
}

}  // namespace siftwave::ledger
