// The words of the trade in header names (header_words.h).
#include "ingest/header_words.h"

#include <gtest/gtest.h>

namespace siftwave::ingest::detail {
namespace {

TEST(IngestHeaderWords, WordsOfTheTradeAreFoundInSixLanguagesWithOrWithoutAccents) {
    for (const char* name :
         {"region",       "District", "county",   "Code",        "state",     "province",
          "municipality", "région",   "REGION",   "département", "commune",   "Kreis",
          "Landkreis",    "Bezirk",   "Gemeinde", "provincia",   "municipio", "departamento",
          "concelho",     "distrito", "comune",   "regione"}) {
        EXPECT_TRUE(headerWordsOf(name).hints(HeaderRole::Region)) << name;
        EXPECT_TRUE(headerWordsOf(name).tradeName) << name;
    }
    for (const char* name : {"date", "week", "day", "semaine", "Woche", "semana", "settimana",
                             "jour", "Datum", "fecha", "data", "Meldedatum", "week_start"}) {
        EXPECT_TRUE(headerWordsOf(name).hints(HeaderRole::Date)) << name;
    }
    for (const char* name :
         {"cases", "deaths", "count", "cas", "décès", "deces", "Fälle", "Faelle", "casos",
          "muertes", "óbitos", "casi", "new_cases", "AnzahlFall", "Todesfälle"}) {
        EXPECT_TRUE(headerWordsOf(name).hints(HeaderRole::Count)) << name;
        EXPECT_TRUE(headerWordsOf(name).tradeName) << name;
    }
    EXPECT_TRUE(headerWordsOf("indicator").hints(HeaderRole::Measure));
}

TEST(IngestHeaderWords, YearAndWeekWordsNameThePartsOfADateInTwoColumns) {
    for (const char* name : {"year", "Jahr", "année", "annee", "año", "ano", "anno", "Meldejahr",
                             "iso_year", "epi_year", "MMWRyear"}) {
        EXPECT_TRUE(headerWordsOf(name).hints(HeaderRole::Year)) << name;
        EXPECT_TRUE(headerWordsOf(name).hints(HeaderRole::Date)) << name;
        EXPECT_FALSE(headerWordsOf(name).hints(HeaderRole::Week)) << name;
        EXPECT_TRUE(headerWordsOf(name).tradeName) << name;
    }
    for (const char* name : {"week", "Woche", "semaine", "semana", "settimana", "wk", "epiweek",
                             "isoweek", "Meldewoche", "Kalenderwoche", "MMWRweek", "KW"}) {
        EXPECT_TRUE(headerWordsOf(name).hints(HeaderRole::Week)) << name;
        EXPECT_FALSE(headerWordsOf(name).hints(HeaderRole::Year)) << name;
    }
    // "KW" is also Kuwait (ISO 3166-1 alpha-2): a week hint, never a trade name.
    EXPECT_FALSE(headerWordsOf("KW").tradeName);
    EXPECT_TRUE(headerWordsOf("week").tradeName);
    EXPECT_TRUE(headerWordsOf("yearweek").hints(HeaderRole::Date));
    // The week convention a name speaks of.
    EXPECT_EQ(headerWordsOf("MMWRweek").weekWords, WeekWords::Mmwr);
    EXPECT_EQ(headerWordsOf("mmwr_year").weekWords, WeekWords::Mmwr);
    EXPECT_EQ(headerWordsOf("epiweek").weekWords, WeekWords::Epidemiological);
    EXPECT_EQ(headerWordsOf("semana epidemiológica").weekWords, WeekWords::Epidemiological);
    EXPECT_TRUE(headerWordsOf("semana epidemiológica").tradeName);
    EXPECT_EQ(headerWordsOf("week").weekWords, WeekWords::None);
}

TEST(IngestHeaderWords, PlacesAndCodesAreNotTradeNames) {
    for (const char* name : {"8336", "NA", "DE-BY", "Region Hannover", "Orange County",
                             "Rhein-Kreis Neuss", "Île-de-France", "Total", "N", "Lancashire",
                             "Region 1", "District of Columbia", "Kreis3"}) {
        EXPECT_FALSE(headerWordsOf(name).tradeName) << name;
    }
    EXPECT_TRUE(headerWordsOf("Region Hannover").hints(HeaderRole::Region));
    EXPECT_TRUE(headerWordsOf("NUTS3").hints(HeaderRole::Region));
    EXPECT_TRUE(isDigitName("8336"));
    EXPECT_TRUE(isDigitName("0412"));
    EXPECT_FALSE(isDigitName("DE-BY"));
}

}  // namespace
}  // namespace siftwave::ingest::detail
