#include "ingest/cell_table_builder.h"

#include <sys/mman.h>

#include <algorithm>
#include <cstring>
#include <new>

namespace siftwave::detail {
namespace {

/// Asks for huge pages on the reserved part of `cells` (a hint): fewer page faults
/// and TLB misses while the table fills.
void adviseHugePages(const std::vector<Cell>& cells) {
#ifdef MADV_HUGEPAGE
    constexpr std::uintptr_t kHuge = std::uintptr_t{2} << 20;
    const auto begin = reinterpret_cast<std::uintptr_t>(cells.data());
    const std::uintptr_t end = begin + cells.capacity() * sizeof(Cell);
    const std::uintptr_t alignedBegin = (begin + kHuge - 1) & ~(kHuge - 1);
    if (end > alignedBegin + kHuge) {
        madvise(reinterpret_cast<void*>(alignedBegin), ((end - alignedBegin) / kHuge) * kHuge,
                MADV_HUGEPAGE);
    }
#else
    (void)cells;
#endif
}

}  // namespace

void CellTableBuilder::reset(std::size_t days) {
    m_days = days;
    m_regions = 0;
    m_blockStart = 0;
    m_stride = 0;
    m_stagedLow = UINT32_MAX;
    m_stagedHigh = 0;
    m_tables.clear();
    m_tables.shrink_to_fit();
    m_staging.clear();
}

bool CellTableBuilder::addMeasure(std::size_t reserveCells) {
    try {
        m_tables.emplace_back();
        m_staging.emplace_back();
        std::vector<Cell>& table = m_tables.back();
        table.reserve(std::max(reserveCells, m_regions * m_days));
        adviseHugePages(table);
        table.resize(m_regions * m_days);
        m_staging.back().resize(kBlockDays * m_stride);
        return true;
    } catch (const std::bad_alloc&) {
        reset(m_days);
        return false;
    }
}

bool CellTableBuilder::growTo(std::size_t regions) {
    try {
        for (std::vector<Cell>& table : m_tables)
            table.resize(regions * m_days);
        if (regions > m_stride) {
            // Room for more regions per staged day: lay the staged days out anew.
            const std::size_t stride = std::max({regions, 2 * m_stride, std::size_t{64}});
            for (std::vector<Cell>& staging : m_staging) {
                std::vector<Cell> wider(kBlockDays * stride);
                for (std::size_t k = 0; k < kBlockDays && m_stride > 0; ++k) {
                    std::copy_n(staging.begin() + static_cast<std::ptrdiff_t>(k * m_stride),
                                m_stride, wider.begin() + static_cast<std::ptrdiff_t>(k * stride));
                }
                staging = std::move(wider);
            }
            m_stride = stride;
        }
        m_regions = regions;
        return true;
    } catch (const std::bad_alloc&) {
        reset(m_days);
        return false;
    }
}

void CellTableBuilder::moveBlockTo(std::size_t day) {
    copyBlock();
    m_blockStart = day - day % kBlockDays;
}

void CellTableBuilder::copyBlock() {
    if (m_stagedLow > m_stagedHigh || m_blockStart >= m_days)
        return;
    const std::size_t run = std::min(kBlockDays, m_days - m_blockStart);
    const std::size_t low = m_stagedLow, high = m_stagedHigh;
    for (std::size_t m = 0; m < m_tables.size(); ++m) {
        Cell* table = m_tables[m].data() + m_blockStart;
        Cell* staging = m_staging[m].data();
        for (std::size_t r = low; r <= high; ++r) {
            // The run of a region a few regions on: ask for its cache lines now.
            if (r + 4 <= high) {
                const char* ahead = reinterpret_cast<const char*>(table + (r + 4) * m_days);
                for (std::size_t byte = 0; byte < run * sizeof(Cell); byte += 64)
                    __builtin_prefetch(ahead + byte, 1);
            }
            Cell* target = table + r * m_days;
            for (std::size_t k = 0; k < run; ++k)
                target[k] = staging[k * m_stride + r];
        }
        for (std::size_t k = 0; k < run; ++k)
            std::fill(staging + k * m_stride + low, staging + k * m_stride + high + 1, Cell{});
    }
    m_stagedLow = UINT32_MAX;
    m_stagedHigh = 0;
}

std::vector<std::vector<Cell>> CellTableBuilder::takeTables() {
    std::vector<std::vector<Cell>> tables = std::move(m_tables);
    const std::size_t days = m_days;
    reset(days);
    return tables;
}

}  // namespace siftwave::detail
