#include "ingest/header_words.h"

#include <array>
#include <string>
#include <vector>

namespace siftwave::ingest::detail {
namespace {

// The word lists, folded (lower case, no accents; see header_words.h), in English, French,
// German, Spanish, Portuguese and Italian. Words shared by several languages are listed once.
// They are headers seen in published surveillance files and their translations (common
// practice, no source). Before adding a word, check that it is not also a place: a place
// name made of these words alone would be refused as a region of a dates-down file.
// clang-format off

/// Columns of region codes or names.
constexpr std::array kRegionWords = std::to_array<std::string_view>({
    "region", "district", "county", "area", "code", "state", "province", "municipality",  // en
    "country", "location", "place", "zone", "geo", "geoid", "iso", "fips", "nuts",
    "territory", "borough", "city", "postcode", "zip", "zipcode",
    "departement", "commune", "canton", "pays", "arrondissement", "insee", "reg", "dep",  // fr
    "kreis", "landkreis", "bezirk", "gemeinde", "bundesland", "land", "ags",             // de
    "provincia", "municipio", "departamento", "comunidad", "ccaa", "estado", "pais",     // es
    "distrito", "comuna",
    "concelho", "freguesia", "regiao", "uf", "ibge",                                     // pt
    "comune", "regione", "regioni", "comuni", "codice", "istat",                         // it
});

/// Columns of dates, or of parts of a date.
constexpr std::array kDateWords = std::to_array<std::string_view>({
    "date", "day", "week", "month", "year", "period", "time", "isoweek", "epiweek",       // en
    "yearweek",
    "semaine", "jour", "mois", "annee",                                                  // fr
    "datum", "woche", "tag", "monat", "jahr",                                            // de
    "fecha", "dia", "semana", "mes", "ano", "data",                                      // es, pt
    "giorno", "settimana", "mese", "anno",                                               // it
});

/// The year of a date written as a year column and a week-number column (also date words).
constexpr std::array kYearWords = std::to_array<std::string_view>({
    "year", "isoyear", "epiyear", "mmwryear",                                            // en
    "annee",                                                                             // fr
    "jahr", "meldejahr",                                                                 // de
    "ano", "anno",                                                                       // es, pt, it
});

/// The week number of such a date (also date words). "Meldewoche" and "Kalenderwoche" end
/// with "woche".
constexpr std::array kWeekWords = std::to_array<std::string_view>({
    "week", "wk", "isoweek", "epiweek", "mmwrweek",                                      // en
    "semaine",                                                                           // fr
    "woche",                                                                             // de
    "semana", "settimana",                                                               // es, pt, it
});

/// Week words that are also places: they hint at a week column but never make a trade name
/// ("KW" is Kalenderwoche and Kuwait's ISO 3166-1 alpha-2 code).
constexpr std::array kWeekWordsThatArePlaces = std::to_array<std::string_view>({"kw"});

/// Words that say the weeks are the US CDC's MMWR weeks (Sunday start by definition).
constexpr std::array kMmwrWords = std::to_array<std::string_view>({
    "mmwr", "mmwrweek", "mmwryear",
});

/// Words that say the weeks are epidemiological weeks, of either convention.
constexpr std::array kEpiWords = std::to_array<std::string_view>({
    "epi", "epiweek", "epiyear", "epidemiological",                                      // en
    "epidemiologique",                                                                   // fr
    "epidemiologische",                                                                  // de
    "epidemiologica", "epidemiologico",                                                  // es, pt, it
});

/// Columns of counts (the measures of a long file).
constexpr std::array kCountWords = std::to_array<std::string_view>({
    "case", "death", "count", "value", "number", "confirmed", "positive", "test",         // en
    "admission", "hospital", "hospitalised", "hospitalized", "hospitalisation",
    "hospitalization", "incidence", "infection", "deceased", "recovered",
    "cas", "deces", "nb", "valeur", "mort", "hospitalise",                               // fr
    "fall", "falle", "faelle", "todesfall", "todesfalle", "todesfaelle", "anzahl",       // de
    "wert", "verstorbene",
    "caso", "casos", "muerte", "muertes", "fallecido", "fallecidos", "defuncion",        // es
    "defunciones", "valor", "numero", "confirmado", "confirmados",
    "obito", "obitos", "morte", "mortes",                                                // pt
    "casi", "decessi", "deceduti", "morti", "valore", "positivi",                        // it
});

/// Columns that name the measure of each row.
constexpr std::array kMeasureWords = std::to_array<std::string_view>({
    "measure", "indicator", "variable", "metric", "outcome",                             // en
    "mesure", "indicateur",                                                              // fr
    "merkmal", "kennzahl", "indikator",                                                  // de
    "indicador", "medida",                                                               // es, pt
    "indicatore", "misura",                                                              // it
});

/// Words that stand beside the words above in a name without making it a place.
constexpr std::array kFillerWords = std::to_array<std::string_view>({
    "id", "name", "nom", "nombre", "nome", "label", "libelle", "bezeichnung", "nr", "no",
    "num", "key", "of", "the", "per", "new", "total", "totale", "daily", "weekly", "cum",
    "cumulative", "cumul", "start", "end", "begin", "first", "last", "reported", "report",
    "de", "du", "des", "la", "le", "del", "di", "da", "do", "der", "die", "neue", "nuevos",
    "novos", "nuovi", "nouveaux",
});

// clang-format on

template <std::size_t N>
bool matchesList(std::string_view word, const std::array<std::string_view, N>& list) {
    for (std::string_view w : list) {
        if (word == w)
            return true;
        if (word.size() == w.size() + 1 && word.back() == 's' && word.starts_with(w))
            return true;
        if (w.size() >= 5 && word.size() > w.size() && word.ends_with(w))
            return true;
    }
    return false;
}

/// The folded letter for the second byte of a two-byte UTF-8 sequence starting with 0xC3
/// (U+00C0 to U+00FF); "" for the two signs in that range (multiplication, division).
std::string_view foldLatin1(unsigned char second) {
    const unsigned char c = second >= 0xA0 ? static_cast<unsigned char>(second - 0x20) : second;
    if (c >= 0x80 && c <= 0x85)
        return "a";
    if (c == 0x86)
        return "ae";
    if (c == 0x87)
        return "c";
    if (c >= 0x88 && c <= 0x8B)
        return "e";
    if (c >= 0x8C && c <= 0x8F)
        return "i";
    if (c == 0x90)
        return "d";
    if (c == 0x91)
        return "n";
    if ((c >= 0x92 && c <= 0x96) || c == 0x98)
        return "o";
    if (c >= 0x99 && c <= 0x9C)
        return "u";
    if (c == 0x9D)
        return "y";
    if (c == 0x9E)
        return "th";
    if (c == 0x9F)
        return second == 0x9F ? "ss" : "y";  // U+00DF sharp s; U+00FF y with diaeresis
    return "";
}

/// The folded words of a name (see header_words.h); a run of digits is a word of its own.
std::vector<std::string> foldedWords(std::string_view name) {
    std::vector<std::string> words;
    std::string word;
    bool previousLower = false;
    bool inDigits = false;
    auto flush = [&] {
        if (!word.empty())
            words.push_back(std::move(word));
        word.clear();
        previousLower = false;
        inDigits = false;
    };
    auto letter = [&](std::string_view folded, bool lower) {
        if (inDigits)
            flush();
        word += folded;
        previousLower = lower;
    };
    for (std::size_t i = 0; i < name.size(); ++i) {
        const auto c = static_cast<unsigned char>(name[i]);
        if (c >= 'A' && c <= 'Z') {
            if (previousLower)
                flush();
            const char lower = static_cast<char>(c - 'A' + 'a');
            letter(std::string_view(&lower, 1), false);
        } else if (c >= 'a' && c <= 'z') {
            letter(std::string_view(&name[i], 1), true);
        } else if (c >= '0' && c <= '9') {
            if (!inDigits)
                flush();
            word += static_cast<char>(c);
            inDigits = true;
        } else if (c == 0xC3 && i + 1 < name.size()) {
            const auto second = static_cast<unsigned char>(name[++i]);
            const std::string_view folded = foldLatin1(second);
            if (folded.empty())
                flush();
            else
                letter(folded, second >= 0xA0);
        } else if (c >= 0x80) {
            letter(std::string_view(&name[i], 1), false);  // a letter of another script
        } else {
            flush();  // spaces, punctuation
        }
    }
    flush();
    return words;
}

}  // namespace

HeaderWords headerWordsOf(std::string_view name) {
    HeaderWords out;
    bool allKnown = true;
    bool anyRoleWord = false;
    for (const std::string& w : foldedWords(name)) {
        std::uint8_t roles = 0;
        if (matchesList(w, kRegionWords))
            roles |= static_cast<std::uint8_t>(HeaderRole::Region);
        if (matchesList(w, kDateWords))
            roles |= static_cast<std::uint8_t>(HeaderRole::Date);
        if (matchesList(w, kCountWords))
            roles |= static_cast<std::uint8_t>(HeaderRole::Count);
        if (matchesList(w, kMeasureWords))
            roles |= static_cast<std::uint8_t>(HeaderRole::Measure);
        if (matchesList(w, kYearWords))
            roles |= static_cast<std::uint8_t>(HeaderRole::Year) |
                     static_cast<std::uint8_t>(HeaderRole::Date);
        if (matchesList(w, kWeekWords))
            roles |= static_cast<std::uint8_t>(HeaderRole::Week) |
                     static_cast<std::uint8_t>(HeaderRole::Date);
        const bool mmwr = matchesList(w, kMmwrWords);
        const bool epi = matchesList(w, kEpiWords);
        if (mmwr)
            out.weekWords = WeekWords::Mmwr;
        else if (epi && out.weekWords == WeekWords::None)
            out.weekWords = WeekWords::Epidemiological;
        out.roles |= roles;
        if (roles != 0)
            anyRoleWord = true;
        else if (matchesList(w, kWeekWordsThatArePlaces))
            out.roles |= static_cast<std::uint8_t>(HeaderRole::Week);
        if (roles == 0 && !mmwr && !epi && !matchesList(w, kFillerWords))
            allKnown = false;
    }
    out.tradeName = anyRoleWord && allKnown;
    return out;
}

bool isDigitName(std::string_view name) {
    while (!name.empty() && name.front() == ' ')
        name.remove_prefix(1);
    while (!name.empty() && name.back() == ' ')
        name.remove_suffix(1);
    if (name.empty())
        return false;
    for (char c : name) {
        if (c < '0' || c > '9')
            return false;
    }
    return true;
}

}  // namespace siftwave::ingest::detail
