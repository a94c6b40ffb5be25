#pragma once
// Words of the trade in header names: the hints role detection takes from a
// header (see role_detection.h). The word lists themselves are in
// header_words.cpp, the one place that holds them.
//
// A name is folded first: ASCII and Latin-1 letters to lower case, accents
// dropped ("Décès" -> "deces", "Fälle" -> "falle", "Óbitos" -> "obitos"), then
// cut into words at every character that is neither a letter nor a digit, where
// a lower-case letter is followed by an upper-case one ("IdLandkreis" -> "id",
// "landkreis") and between letters and digits ("Region 1", "NUTS3": a run of
// digits is a word of its own, in no list).
// A word matches a list when
//   - it is in the list, or
//   - it is a list word followed by "s" ("regions", "districts"), or
//   - it ends with a list word of five letters or more (German compounds:
//     "Meldedatum" ends with "datum", "Meldewoche" with "woche").
// A name *hints* at a role (region, date, count, measure) when one of its words
// matches that role's list. A name is a *trade name* when at least one word
// matches a role list and every other word is a role word or a filler word
// ("id", "name", "new", "total", "start", ...): "region", "new_cases",
// "week_start", "Landkreis", "code_departement". A place is not a trade name
// even when one of its words is ("Region Hannover", "Orange County",
// "Rhein-Kreis Neuss", "Region 1", "District of Columbia"), nor is a code
// ("8336", "NA").
//
// Two more roles name the parts of a date written in two columns, a year and a
// week number ("year,week,region,cases"; role_detection.h): a *year* word
// ("year", "Jahr", "année", "año", "anno") and a *week* word ("week", "Woche",
// "semaine", "semana", "settimana", "epiweek", "isoweek"). Either also hints at
// the date. "KW" (Kalenderwoche) hints at a week but never makes a trade name:
// it is also Kuwait's ISO 3166-1 code. A name may also say which week convention
// it counts in: "mmwr" (the US CDC's MMWR weeks, Sunday start by definition) or
// "epi" ("epiweek", "epi_year", "semana epidemiológica": epidemiological weeks,
// which start on Sunday in the Americas and on Monday, as ISO weeks, in Europe).

#include <cstdint>
#include <string_view>

namespace siftwave::ingest::detail {

enum class HeaderRole : std::uint8_t {
    Region = 1,
    Date = 2,
    Count = 4,
    Measure = 8,
    Year = 16,  // the year of a date written as a year and a week number
    Week = 32,  // the week number of such a date
};

/// The week convention a name's words speak of.
enum class WeekWords : std::uint8_t {
    None,
    Epidemiological,  // "epi", "epiweek", "epidemiological": Sunday or Monday start
    Mmwr,             // "mmwr", "MMWRweek": the CDC's MMWR weeks, Sunday start
};

struct HeaderWords {
    std::uint8_t roles = 0;  // the roles (HeaderRole bits) some word of the name hints at
    bool tradeName = false;  // see above: the name is made of words of the trade only
    WeekWords weekWords = WeekWords::None;  // the week convention a word names

    bool hints(HeaderRole role) const { return (roles & static_cast<std::uint8_t>(role)) != 0; }
};

/// What the words of a header name (or a cell) say; see the top of this file.
HeaderWords headerWordsOf(std::string_view name);

/// True when `name`, without surrounding spaces, is one or more ASCII digits ("8336", "0412"):
/// the shape of a region code, never of a role name.
bool isDigitName(std::string_view name);

}  // namespace siftwave::ingest::detail
