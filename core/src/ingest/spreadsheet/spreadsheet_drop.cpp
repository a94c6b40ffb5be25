// readSpreadsheetDrop, in its steps: open the workbook, choose the sheet, find its table, write
// the table as CSV text, read that text with the DropReader, and name the workbook, the sheet
// and the cells in the Drop and in any error.
#include "ingest/spreadsheet/spreadsheet_drop.h"

#include "ingest/drop_reader.h"
#include "ingest/spreadsheet/sheet_table.h"
#include "ingest/spreadsheet/workbook_open.h"

#include "common/sha256.h"

#include <algorithm>

namespace siftwave::ingest::detail {
namespace {

struct ChosenSheet {
    std::size_t index = 0;
    std::vector<SheetRow> head;
    std::vector<MergedRange> merges;
    bool whole = false;  // the head rows are the whole sheet (and the merges all of them)
};

Error usageError(const std::string& path, std::string message) {
    Error e = makeError(ErrorCode::Usage, std::move(message));
    e.file = path;
    return e;
}

std::string sheetList(const std::vector<std::string>& names) {
    std::string list;
    for (std::size_t i = 0; i < names.size(); ++i)
        list += (i ? ", " : "") + std::to_string(i + 1) + " '" + names[i] + "'";
    return list.empty() ? "none" : list;
}

Status readHead(Workbook& book, std::size_t index, ChosenSheet& chosen) {
    HeadRows head;
    chosen.index = index;
    chosen.merges.clear();
    if (Status s = book.readRows(index, head, chosen.merges); !s)
        return s;
    chosen.whole = head.rows.size() < kHeadRows;
    chosen.head = std::move(head.rows);
    return Ok{};
}

/// The sheet --sheet names (a name first, then a 1-based position), else the first sheet whose
/// first rows hold dates, else the first sheet that is not empty.
Result<ChosenSheet> chooseSheet(Workbook& book, const IngestOptions& options,
                                const std::string& path) {
    const std::vector<std::string>& names = book.sheetNames();
    ChosenSheet chosen;
    if (!options.sheet.empty()) {
        auto named = std::find(names.begin(), names.end(), options.sheet);
        std::size_t index = static_cast<std::size_t>(named - names.begin());
        if (named == names.end()) {
            const bool digits = std::all_of(options.sheet.begin(), options.sheet.end(),
                                            [](char c) { return c >= '0' && c <= '9'; });
            const std::size_t n =
                digits && options.sheet.size() < 6 ? std::stoul(options.sheet) : 0;
            if (n < 1 || n > names.size())
                return usageError(path, "the workbook has no sheet '" + options.sheet +
                                            "'; its sheets are " + sheetList(names));
            index = n - 1;
        }
        if (Status s = readHead(book, index, chosen); !s)
            return s.error();
        return chosen;
    }
    std::optional<ChosenSheet> firstFilled;
    for (std::size_t i = 0; i < names.size(); ++i) {
        if (Status s = readHead(book, i, chosen); !s)
            return s.error();
        if (holdsDates(chosen.head))
            return chosen;
        if (!firstFilled && !chosen.head.empty())
            firstFilled = chosen;
    }
    if (firstFilled)
        return *firstFilled;
    Error e = makeError(ErrorCode::Layout, "every sheet of the workbook is empty (sheets: " +
                                               sheetList(names) + "); there is nothing to read");
    e.file = path;
    return e;
}

/// The table's rows as CSV text, and the notes about the sheet.
Status writeTable(Workbook& book, ChosenSheet& chosen, const std::string& path, std::string& csv,
                  std::vector<Warning>& notes, std::uint32_t& firstColumn) {
    const std::string& name = book.sheetNames()[chosen.index];
    if (chosen.head.empty()) {
        Error e = makeError(ErrorCode::Layout,
                            "sheet '" + name + "' is empty; pick another with --sheet (sheets: " +
                                sheetList(book.sheetNames()) + ")");
        e.file = path;
        return e;
    }
    if (!chosen.whole && mayHaveTwoRowHeader(chosen.head)) {
        Result<std::vector<MergedRange>> merges = book.mergesOf(chosen.index);
        if (!merges)
            return merges.error();
        chosen.merges = std::move(*merges);
    }
    const TablePlan plan = planTable(chosen.head, chosen.merges);
    firstColumn = plan.firstColumn;
    if (plan.lastColumn == plan.firstColumn) {
        Error e = makeError(ErrorCode::Layout,
                            "sheet '" + name +
                                "' holds a single column, not a table of dates, regions and "
                                "counts; pick another with --sheet (sheets: " +
                                sheetList(book.sheetNames()) + ")");
        e.file = path;
        return e;
    }
    // The CSV text is shorter than the sheet's XML: reserved at that size once, it never moves
    // (and the pages it does not fill are never touched, so they cost no memory).
    csv.reserve(static_cast<std::size_t>(
        std::min<std::uint64_t>(book.partBytes(chosen.index), CsvTextWriter::kMaxBytes)));
    CsvTextWriter writer(plan, csv);
    std::vector<MergedRange> ignored;
    if (Status s = book.readRows(chosen.index, writer, ignored); !s)
        return s;
    if (writer.tooLarge()) {
        Error e = makeError(
            ErrorCode::Layout,
            "sheet '" + name + "' holds more than 1 GiB of cell text, more than a drop may");
        e.file = path;
        return e;
    }
    writer.finish();
    notes = plan.notes;
    notes.insert(notes.end(), writer.notes.begin(), writer.notes.end());
    return Ok{};
}

/// The sheets whose first rows hold dates (only when there are several sheets to choose from). A
/// sheet that cannot be read is not listed: choosing it would report why.
std::vector<std::string> datedSheetsOf(Workbook& book, const ChosenSheet& chosen) {
    const std::vector<std::string>& names = book.sheetNames();
    std::vector<std::string> dated;
    if (names.size() < 2)
        return dated;
    for (std::size_t i = 0; i < names.size(); ++i) {
        ChosenSheet other;
        if (i == chosen.index ? holdsDates(chosen.head)
                              : readHead(book, i, other) && holdsDates(other.head))
            dated.push_back(names[i]);
    }
    return dated;
}

void nameTheWorkbook(Drop& drop, std::string_view bytes, const std::string& path,
                     SpreadsheetFormat format, const Workbook& book, std::size_t sheet,
                     std::uint32_t firstColumn) {
    Provenance& p = drop.source;
    p.path = path;
    p.bytes = bytes.size();
    siftwave::detail::Sha256 sha;
    sha.update(bytes.data(), bytes.size());
    p.sha256 = sha.hexDigest();
    p.format = spreadsheetFormatName(format);
    p.sheets = book.sheetNames();
    p.sheet = book.sheetNames()[sheet];
    p.firstColumn = firstColumn;
    p.dialect = Dialect{};
}

}  // namespace

std::optional<Result<Drop>> readSpreadsheetDrop(std::string_view bytes, const std::string& path,
                                                const IngestOptions& options) {
    SpreadsheetFormat format = SpreadsheetFormat::Xlsx;
    std::optional<Result<std::unique_ptr<Workbook>>> opened = openWorkbook(bytes, path, format);
    if (!opened)
        return std::nullopt;
    if (!*opened)
        return Result<Drop>(opened->error());
    Workbook& book = ***opened;
    if (options.delimiter)  // said, not ignored: the option was meant for a text file
        return Result<Drop>(usageError(
            path, "--delimiter applies to a CSV file, and this file is an ." +
                      std::string(spreadsheetFormatName(format)) +
                      " workbook, whose cells are already apart; leave --delimiter out"));
    Result<ChosenSheet> chosen = chooseSheet(book, options, path);
    if (!chosen)
        return Result<Drop>(chosen.error());
    std::string csv;
    std::vector<Warning> notes;
    std::uint32_t firstColumn = 0;
    if (Status s = writeTable(book, *chosen, path, csv, notes, firstColumn); !s)
        return Result<Drop>(s.error());

    IngestOptions csvOptions = options;
    csvOptions.sheet.clear();
    csvOptions.delimiter = ',';  // the CSV text is written with commas
    Provenance place;
    place.format = spreadsheetFormatName(format);
    place.sheet = book.sheetNames()[chosen->index];
    place.firstColumn = firstColumn;
    DropReader reader(csv, path, csvOptions, nullptr);
    reader.readAsSheetOf(place);
    Result<Drop> drop = reader.run();
    if (!drop) {
        Error e = drop.error();
        e.file = path;
        e.cell = sourcePlace(place, e.line, e.column);
        for (const Warning& note : notes)  // what the sheet said of that cell (an error value)
            if (e.line > 0 && note.line == e.line && note.column == e.column)
                e.message += " (" + note.message + ")";
        return Result<Drop>(std::move(e));
    }
    nameTheWorkbook(*drop, bytes, path, format, book, chosen->index, firstColumn);
    drop->source.datedSheets = datedSheetsOf(book, *chosen);
    drop->warnings.insert(drop->warnings.begin(), notes.begin(), notes.end());
    return drop;
}

}  // namespace siftwave::ingest::detail
