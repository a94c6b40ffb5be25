// The 3 M-row benchmark drop (bench_long_drop.h: 3,000 regions x 1,000 days, date, region,
// cases) read as CSV and as an .xlsx workbook that the benchmark writes itself with libzip: the
// same 3 M cells as one dates-down table (a sheet holds at most 1,048,576 rows, ECMA-376 and the
// spreadsheet programs' limit, so the long file's 3 M rows cannot be one sheet), dates as serial
// numbers with built-in date format 14, region codes as shared strings, counts as numbers. The
// same wide table is also written as CSV, so the peak memory compares with both the long CSV
// (the benchmark drop) and the wide CSV (the same table). Issue 18's targets: at least 100 MB/s
// of uncompressed sheet XML on one core, and peak memory within 2 x the CSV's.
//
// Each read runs in a child process (fork), so each format's peak resident size (ru_maxrss of
// the child) is its own and not the highest seen so far. Counters: sheet_xml_MB and
// xml_MB_per_s (the uncompressed sheet XML over the read's wall-clock time, end to end: open,
// inflate, parse, write the CSV text, read it into the Drop; xml_MB_per_cpu_s over the read's
// own CPU time, for a machine shared with other work), peak_MB, and for the workbook
// peak_x_csv, its peak over the CSV's.
#include "siftwave/ingest/ingest.h"

#include "bench_long_drop.h"

#include <benchmark/benchmark.h>
#include <sys/wait.h>
#include <zip.h>

#include <chrono>
#include <fstream>
#include <map>

namespace {

using namespace siftwave::bench;

struct ChildRead {
    double seconds = 0;
    double cpuSeconds = 0;  // the child's own CPU time (wall clock suffers on a shared machine)
    double peakBytes = 0;
    bool ok = false;
};

/// Reads `path` in a child process: its wall-clock time and its own peak resident size.
ChildRead readInChild(const std::string& path) {
    int fds[2];
    if (pipe(fds) != 0)
        return {};
    const pid_t pid = fork();
    if (pid == 0) {
        close(fds[0]);
        const auto start = std::chrono::steady_clock::now();
        const double cpuStart = processCpuSeconds();
        const auto drop = siftwave::ingest::readDrop(path);
        ChildRead r;
        r.seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
        r.cpuSeconds = processCpuSeconds() - cpuStart;
        r.peakBytes = peakRssBytes();
        r.ok = drop.ok() && drop->regionCodes.size() == static_cast<std::size_t>(kRegions) &&
               drop->periods() == kDays;
        if (!drop.ok())
            std::fprintf(stderr, "%s\n", drop.error().describe().c_str());
        const ssize_t written = write(fds[1], &r, sizeof r);
        _exit(written == sizeof r ? 0 : 1);
    }
    close(fds[1]);
    ChildRead r;
    if (read(fds[0], &r, sizeof r) != sizeof r)
        r.ok = false;
    close(fds[0]);
    int status = 0;
    waitpid(pid, &status, 0);
    return r;
}

/// Column letters of a 0-based column (A, ..., Z, AA, ...).
std::string letters(std::size_t column) {
    std::string out;
    for (std::size_t n = column + 1; n > 0; n = (n - 1) / 26)
        out.insert(out.begin(), static_cast<char>('A' + (n - 1) % 26));
    return out;
}

/// The long CSV's drop as one wide table (a row per date, a column per region: 1,001 rows and
/// 3,001 columns; a sheet holds at most 1,048,576 rows, so 3 M rows cannot be one sheet),
/// written as sheet XML to `xmlPath` (region codes as shared strings in `strings`) and as a
/// dates-down CSV to `widePath`, the CSV twin of the workbook.
bool writeWideSheet(const std::string& csvPath, const std::string& xmlPath,
                    const std::string& widePath, std::vector<std::string>& strings) {
    std::ifstream in(csvPath);
    std::FILE* out = std::fopen(xmlPath.c_str(), "wb");
    std::FILE* wide = std::fopen(widePath.c_str(), "wb");
    if (!in || !out || !wide)
        return false;
    const siftwave::Date base = *siftwave::Date::fromIso("1899-12-30");  // 1900 system, >= 61
    std::fputs(
        "<?xml version=\"1.0\" encoding=\"UTF-8\" standalone=\"yes\"?>\n<worksheet xmlns="
        "\"http://schemas.openxmlformats.org/spreadsheetml/2006/main\"><sheetData>"
        "<row r=\"1\"><c r=\"A1\" t=\"inlineStr\"><is><t>date</t></is></c>",
        out);
    std::fputs("date", wide);
    for (int r = 0; r < kRegions; ++r) {
        char code[16];
        std::snprintf(code, sizeof code, "D%04d", r);  // bench_long_drop.h's codes, in its order
        strings.emplace_back(code);
        std::fprintf(out, "<c r=\"%s1\" t=\"s\"><v>%d</v></c>",
                     letters(static_cast<std::size_t>(r) + 1).c_str(), r);
        std::fprintf(wide, ",%s", code);
    }
    std::fputs("</row>", out);
    std::string line, date;
    std::getline(in, line);
    std::size_t row = 1, column = 0;
    while (std::getline(in, line)) {
        const std::size_t a = line.find(','), b = line.find(',', a + 1);
        if (line.compare(0, a, date) != 0) {
            if (row > 1)
                std::fputs("</row>", out);
            date = line.substr(0, a);
            ++row;
            column = 1;
            std::fprintf(out, "<row r=\"%zu\"><c r=\"A%zu\" s=\"1\"><v>%d</v></c>", row, row,
                         *siftwave::Date::fromIso(date) - base);
            std::fprintf(wide, "\n%s", date.c_str());
        }
        std::fprintf(out, "<c r=\"%s%zu\"><v>%s</v></c>", letters(column++).c_str(), row,
                     line.c_str() + b + 1);
        std::fprintf(wide, ",%s", line.c_str() + b + 1);
    }
    std::fputs("</row></sheetData></worksheet>", out);
    std::fputs("\n", wide);
    std::fclose(out);
    std::fclose(wide);
    return true;
}

bool addPart(zip_t* archive, const char* name, const std::string& bytes) {
    zip_source_t* source = zip_source_buffer(archive, bytes.data(), bytes.size(), 0);
    return source && zip_file_add(archive, name, source, ZIP_FL_OVERWRITE) >= 0;
}

/// The workbook around the sheet XML: the package parts ECMA-376 Part 2 needs, libzip's
/// default deflate.
std::string writeXlsx(const std::string& csvPath, const std::string& widePath, double& xmlBytes) {
    const std::string stem = csvPath.substr(0, csvPath.size() - 4);
    const std::string xmlPath = stem + ".sheet.xml", xlsxPath = stem + ".xlsx";
    std::vector<std::string> strings;
    if (!writeWideSheet(csvPath, xmlPath, widePath, strings))
        return {};
    xmlBytes = static_cast<double>(std::filesystem::file_size(xmlPath));
    const std::string ns = "http://schemas.openxmlformats.org/";
    const std::string rel = ns + "officeDocument/2006/relationships/";
    std::string sst = "<sst xmlns=\"" + ns + "spreadsheetml/2006/main\">";
    for (const std::string& s : strings)
        sst += "<si><t>" + s + "</t></si>";
    sst += "</sst>";
    const std::string parts[][2] = {
        {"[Content_Types].xml", "<Types xmlns=\"" + ns + "package/2006/content-types\"/>"},
        {"_rels/.rels", "<Relationships xmlns=\"" + ns +
                            "package/2006/relationships\">"
                            "<Relationship Id=\"r1\" Type=\"" +
                            rel +
                            "officeDocument\" Target=\"xl/"
                            "workbook.xml\"/></Relationships>"},
        {"xl/workbook.xml", "<workbook xmlns=\"" + ns + "spreadsheetml/2006/main\" xmlns:r=\"" +
                                ns +
                                "officeDocument/2006/relationships\"><sheets><sheet name=\""
                                "data\" sheetId=\"1\" r:id=\"r1\"/></sheets></workbook>"},
        {"xl/_rels/workbook.xml.rels",
         "<Relationships xmlns=\"" + ns +
             "package/2006/relationships\"><Relationship Id=\"r1\" "
             "Type=\"" +
             rel +
             "worksheet\" Target=\"worksheets/sheet1.xml\"/><Relationship Id=\"r2\" "
             "Type=\"" +
             rel + "styles\" Target=\"styles.xml\"/><Relationship Id=\"r3\" Type=\"" + rel +
             "sharedStrings\" Target=\"sharedStrings.xml\"/></Relationships>"},
        {"xl/styles.xml", "<styleSheet xmlns=\"" + ns +
                              "spreadsheetml/2006/main\"><cellXfs>"
                              "<xf numFmtId=\"0\"/><xf numFmtId=\"14\"/></cellXfs></styleSheet>"},
        {"xl/sharedStrings.xml", sst}};
    int error = 0;
    zip_t* archive = zip_open(xlsxPath.c_str(), ZIP_CREATE | ZIP_TRUNCATE, &error);
    if (!archive)
        return {};
    for (const auto& part : parts)
        if (!addPart(archive, part[0].c_str(), part[1]))
            return {};
    zip_source_t* sheet = zip_source_file(archive, xmlPath.c_str(), 0, -1);
    if (!sheet || zip_file_add(archive, "xl/worksheets/sheet1.xml", sheet, 0) < 0 ||
        zip_close(archive) != 0)
        return {};
    std::filesystem::remove(xmlPath);
    return xlsxPath;
}

void readSpreadsheetDrop(benchmark::State& state) {
    const std::string csv = generate(1, false);
    const std::string wideCsv = csv.substr(0, csv.size() - 4) + ".wide.csv";
    double xmlBytes = 0;
    const std::string xlsx = csv.empty() ? std::string() : writeXlsx(csv, wideCsv, xmlBytes);
    if (xlsx.empty()) {
        state.SkipWithError("cannot write the benchmark files");
        return;
    }
    const ChildRead csvRead = readInChild(csv);
    const ChildRead wideRead = readInChild(wideCsv);
    ChildRead last;
    for (auto _ : state) {
        last = readInChild(xlsx);
        if (!last.ok || !csvRead.ok || !wideRead.ok) {
            state.SkipWithError("the drop was not read whole");
            break;
        }
        state.SetIterationTime(last.seconds);
    }
    state.counters["sheet_xml_MB"] = xmlBytes / 1e6;
    state.counters["xlsx_MB"] = static_cast<double>(std::filesystem::file_size(xlsx)) / 1e6;
    state.counters["xml_MB_per_s"] = xmlBytes / 1e6 / last.seconds;
    state.counters["xml_MB_per_cpu_s"] = xmlBytes / 1e6 / last.cpuSeconds;
    state.counters["csv_MB_per_s"] =
        static_cast<double>(std::filesystem::file_size(csv)) / 1e6 / csvRead.seconds;
    state.counters["peak_MB"] = last.peakBytes / 1e6;
    state.counters["csv_peak_MB"] = csvRead.peakBytes / 1e6;
    state.counters["peak_x_csv"] = last.peakBytes / csvRead.peakBytes;
    state.counters["wide_csv_peak_MB"] = wideRead.peakBytes / 1e6;
    state.counters["peak_x_wide_csv"] = last.peakBytes / wideRead.peakBytes;
    std::filesystem::remove(wideCsv);
    std::filesystem::remove(csv);
    std::filesystem::remove(xlsx);
}

BENCHMARK(readSpreadsheetDrop)->Unit(benchmark::kMillisecond)->UseManualTime()->Iterations(3);

}  // namespace

BENCHMARK_MAIN();
