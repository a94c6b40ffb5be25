#include "ingest/cell_table_builder.h"

#include <sys/mman.h>

#if defined(__SSE2__)
#include <emmintrin.h>
#endif

#include <algorithm>
#include <cstring>
#include <new>

namespace siftwave::ingest::detail {
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

/// Copies fewer than 64 bytes as two overlapping fixed-size pieces (no library call).
void copySmall(char* to, const char* from, std::size_t bytes) {
    if (bytes >= 32) {
        std::memcpy(to, from, 32);
        std::memcpy(to + bytes - 32, from + bytes - 32, 32);
    } else if (bytes >= 16) {
        std::memcpy(to, from, 16);
        std::memcpy(to + bytes - 16, from + bytes - 16, 16);
    } else if (bytes >= 8) {
        std::memcpy(to, from, 8);
        std::memcpy(to + bytes - 8, from + bytes - 8, 8);
    } else if (bytes >= 4) {
        std::memcpy(to, from, 4);
        std::memcpy(to + bytes - 4, from + bytes - 4, 4);
    } else {
        for (std::size_t i = 0; i < bytes; ++i)
            to[i] = from[i];
    }
}

/// Copies `bytes` bytes from `from` to `to`: the whole cache lines among them with
/// streaming (non-temporal) stores, which do not first read from memory the line
/// they overwrite, and the partial lines at either end with ordinary stores.
void writeRun(char* to, const char* from, std::size_t bytes) {
#if defined(__SSE2__)
    const auto begin = reinterpret_cast<std::uintptr_t>(to);
    const std::size_t head = ((begin + 63) & ~std::uintptr_t{63}) - begin;
    const std::size_t lines = bytes > head ? (bytes - head) / 64 : 0;
    if (lines > 0) {
        copySmall(to, from, head);
        for (std::size_t i = 0; i < lines; ++i) {
            const std::size_t at = head + 64 * i;
            auto* line = reinterpret_cast<__m128i*>(to + at);
            for (int k = 0; k < 4; ++k) {
                _mm_stream_si128(line + k, _mm_loadu_si128(reinterpret_cast<const __m128i*>(
                                               from + at + 16 * static_cast<std::size_t>(k))));
            }
        }
        const std::size_t tail = head + 64 * lines;
        copySmall(to + tail, from + tail, bytes - tail);
        return;
    }
#endif
    std::memcpy(to, from, bytes);
}

}  // namespace

void CellTableBuilder::reset(std::size_t days) {
    m_days = days;
    m_blockDays = std::min(kBlockDays, days / 8);
    if (m_blockDays < 4)
        m_blockDays = 0;
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
        m_staging.back().resize(m_blockDays * m_stride);
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
                std::vector<Cell> wider(m_blockDays * stride);
                for (std::size_t k = 0; k < m_blockDays && m_stride > 0; ++k) {
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
    m_blockStart = day - day % m_blockDays;
}

void CellTableBuilder::copyBlock() {
    if (m_stagedLow > m_stagedHigh || m_blockStart >= m_days)
        return;
    const std::size_t run = std::min(m_blockDays, m_days - m_blockStart);
    const std::size_t low = m_stagedLow, high = m_stagedHigh;
    Cell gathered[kBlockDays];
    for (std::size_t m = 0; m < m_tables.size(); ++m) {
        Cell* table = m_tables[m].data() + m_blockStart;
        Cell* staging = m_staging[m].data();
        for (std::size_t r = low; r <= high; ++r) {
            // The partial cache lines at the ends of the run of a region a few regions on
            // will be read before they are written: ask for them now.
            if (r + 4 <= high) {
                const char* ahead = reinterpret_cast<const char*>(table + (r + 4) * m_days);
                __builtin_prefetch(ahead, 1);
                __builtin_prefetch(ahead + run * sizeof(Cell) - 1, 1);
            }
            for (std::size_t k = 0; k < run; ++k) {
                Cell& staged = staging[k * m_stride + r];
                gathered[k] = staged;
                staged = Cell{};  // the block is empty again for its next days
            }
            writeRun(reinterpret_cast<char*>(table + r * m_days),
                     reinterpret_cast<const char*>(gathered), run * sizeof(Cell));
        }
    }
#if defined(__SSE2__)
    _mm_sfence();  // the streaming stores of writeRun are ordered before what follows
#endif
    m_stagedLow = UINT32_MAX;
    m_stagedHigh = 0;
}

std::vector<std::vector<Cell>> CellTableBuilder::takeTables() {
    std::vector<std::vector<Cell>> tables = std::move(m_tables);
    const std::size_t days = m_days;
    reset(days);
    return tables;
}

}  // namespace siftwave::ingest::detail
