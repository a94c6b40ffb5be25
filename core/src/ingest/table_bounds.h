#pragma once
// The bounds of a drop's cell tables, shared by the readers (drop_passes.cpp,
// case_list_reader.cpp): a table is refused before it is allocated when it would hold more than
// kMaxCells cells, or more than kSparseFloorCells cells (about 240 MB) and over kMaxCellsPerValue
// cells for each value the file's data rows can hold. The refusal names the narrowing options
// (--from, --to,
// --only-regions) that make the table fit.

namespace siftwave::ingest::detail {

inline constexpr double kMaxCells = 1.5e9;
inline constexpr double kSparseFloorCells = 2e7;
inline constexpr double kMaxCellsPerValue = 64;

}  // namespace siftwave::ingest::detail
