// The words of the trade in header names (header_words.h).
#include "ingest/header_words.h"

#include <gtest/gtest.h>

namespace siftwave::detail {
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
}  // namespace siftwave::detail
