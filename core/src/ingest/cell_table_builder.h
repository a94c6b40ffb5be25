#pragma once
// The cell tables of a drop while they are filled: one per measure, each
// region-major (a region's days are contiguous, as CellTable keeps them).
//
// Rows usually come date by date, so two consecutive cells of a row order land
// a whole region (days x 12 bytes) apart in a region-major table, and nearly
// every write misses the cache. The builder therefore keeps a staging block of
// up to kBlockDays days for every region (small enough to stay in the cache): a cell
// whose day falls in the block is written there, and when a row's day passes
// the block, the block is copied into the tables as one short contiguous run
// per region. The block is day-major (a day's regions side by side), so rows
// that come date by date also write it front to back. A cell before the block
// (a file sorted region by region, or not sorted) is written to its table
// directly.
//
// The block only moves forward, and a direct write only ever goes to a day
// before it, so the tables' days of a block are untouched (Absent) when the
// block is copied over them. Whether a cell was already filled (a duplicate) is
// told by the staging block for the block's days and by the table otherwise.
// The block has at most an eighth of the calendar's days (so it never takes more
// than a quarter of the tables' memory), and a calendar under 32 days has none:
// every cell is then written to its table directly.
// (Common practice, no source: the write-combining of a scattered transpose.)

#include "siftwave/drop.h"

#include <algorithm>
#include <cstddef>
#include <cstdint>
#include <vector>

namespace siftwave::ingest::detail {

class CellTableBuilder {
public:
    /// Days of the staging block at most: 16 cells are 192 bytes, three cache lines
    /// per region.
    static constexpr std::size_t kBlockDays = 16;

    /// Starts over with no measure and no region, for a calendar of `days` days.
    void reset(std::size_t days);
    /// Adds a measure whose table has room reserved for `reserveCells` cells (more
    /// regions may still come); false when the memory cannot be had.
    bool addMeasure(std::size_t reserveCells);
    /// Makes every measure's table (and staging block) `regions` regions long;
    /// false when the memory cannot be had.
    bool growTo(std::size_t regions);

    std::size_t measures() const { return m_tables.size(); }
    std::size_t regions() const { return m_regions; }

    /// Stores `cell` at (measure, region, day) unless that place was filled
    /// before: then nothing is stored and `firstLine` tells the first row's line.
    bool put(std::size_t measure, std::uint32_t region, std::int32_t day, const Cell& cell,
             std::uint32_t& firstLine) {
        const auto d = static_cast<std::size_t>(day);
        if (d - m_blockStart < m_blockDays) {  // also false for d < m_blockStart (wraps)
            Cell& staged = m_staging[measure][(d - m_blockStart) * m_stride + region];
            if (staged.state != CellState::Absent) {
                firstLine = staged.line;
                return false;
            }
            store(staged, cell);
            m_stagedLow = std::min(m_stagedLow, region);
            m_stagedHigh = std::max(m_stagedHigh, region);
            return true;
        }
        if (d > m_blockStart && m_blockDays > 0) {
            moveBlockTo(d);
            return put(measure, region, day, cell, firstLine);
        }
        Cell& target = m_tables[measure][region * m_days + d];
        if (target.state != CellState::Absent) {
            firstLine = target.line;
            return false;
        }
        store(target, cell);
        return true;
    }

    /// Copies the staging block into the tables; call once after the last put.
    void finish() { copyBlock(); }
    /// The tables (region-major, `regions() * days` cells each); the builder is reset.
    std::vector<std::vector<Cell>> takeTables();

private:
    /// Field by field: a cell just parsed often sits on the stack as two 4-byte
    /// stores, and copying it as one 8-byte load would wait for both (a failed
    /// store-to-load forward).
    static void store(Cell& target, const Cell& cell) {
        target.value = cell.value;
        target.line = cell.line;
        target.state = cell.state;
    }
    void moveBlockTo(std::size_t day);
    void copyBlock();

    std::size_t m_days = 0;
    std::size_t m_regions = 0;
    std::size_t m_stride = 0;      // cells per staged day (>= regions)
    std::size_t m_blockDays = 0;   // days of the staging block: 0 (none) or 4 .. kBlockDays
    std::size_t m_blockStart = 0;  // first day of the staging block
    std::uint32_t m_stagedLow = UINT32_MAX;    // the regions with a staged cell lie in
    std::uint32_t m_stagedHigh = 0;            // m_stagedLow .. m_stagedHigh
    std::vector<std::vector<Cell>> m_tables;   // per measure, m_regions * m_days
    std::vector<std::vector<Cell>> m_staging;  // per measure, m_blockDays * m_stride, day-major
};

}  // namespace siftwave::ingest::detail
