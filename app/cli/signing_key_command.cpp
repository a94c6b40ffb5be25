// siftwave-cli signing-key --create | --show [--key FILE]: the user's Ed25519 key for signing
// ledger entries (siftwave/ledger/signing.h).
#include "commands.h"
#include "common.h"
#include "ledger_support.h"

#include "siftwave/ledger/replay.h"

#include "siftwave/ledger/signing.h"

#include <cstdio>

namespace siftwave::cli {
namespace {

const char* kUsage =
    "usage: siftwave-cli signing-key --create [--key FILE] [--json]\n"
    "       siftwave-cli signing-key --show [--key FILE] [--json]\n"
    "\n"
    "Your Ed25519 key for signing ledger entries (decide --sign). --create makes a new key in\n"
    "your data folder (or FILE), readable by you only; an existing key is never overwritten.\n"
    "--show prints its public key. Give the line it prints ('PUBLIC-KEY NAME') to the people\n"
    "who check your ledgers: they add it to their trusted-keys file, and ledger --verify then\n"
    "names you beside each entry you signed. Keep the key file private: whoever holds it can\n"
    "sign as you.\n"
    "Exit codes: 0 good, 1 no key or a key that cannot be read or written, 2 wrong usage.\n"
    "\n"
    "options:\n";

std::vector<FlagSpec> keyFlagSpecs() {
    return {
        {"create", false, false, "", "make a new key (never overwrites one)"},
        {"show", false, false, "", "print the public key"},
        {"key", true, false, "FILE", "the key file (default: in your data folder)"},
        {"json", false, false, "", "print JSON instead of text"},
        {"help", false, false, "", "show this help"},
    };
}

std::string usageText() {
    return std::string(kUsage) + formatFlags(keyFlagSpecs());
}

}  // namespace

int runSigningKey(int argc, char** argv, int first) {
    const CommandLine line =
        parseWithPositionals(argc, argv, first, keyFlagSpecs(), usageText(), 0, "");
    if (!line.args)
        return line.exitCode;
    const ParsedArgs& args = *line.args;
    if (args.has("create") == args.has("show"))
        return usageError("signing-key needs --create or --show", line.json, usageText());
    const std::string path = args.has("key") ? args.value("key") : ledger::defaultSigningKeyPath();
    Result<ledger::SigningKey> key =
        args.has("create") ? ledger::SigningKey::generate() : ledger::SigningKey::load(path);
    if (key && args.has("create")) {
        if (Status s = key->save(path); !s)
            key = s.error();
    }
    if (!key) {
        printError(key.error(), line.json);
        return kExitBadInput;
    }
    const std::string holder = ledger::defaultAuthor();
    if (line.json) {
        printJson({{"key_file", path},
                   {"public_key", key->publicKeyHex()},
                   {"created", args.has("create")},
                   {"trusted_keys_line", key->publicKeyHex() + " " + holder}});
        return kExitOk;
    }
    std::printf("%s %s\n", args.has("create") ? "new key written to" : "key",
                terminalText(path).c_str());
    std::printf("public key, for others' trusted-keys files (%s):\n%s %s\n",
                terminalText(ledger::defaultTrustedKeysPath()).c_str(), key->publicKeyHex().c_str(),
                terminalText(holder).c_str());
    return kExitOk;
}

}  // namespace siftwave::cli
