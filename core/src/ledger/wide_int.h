#pragma once
// A 128-bit integer for exact products of counts and weights (GCC/Clang extension).

namespace siftwave::ledger::detail {

__extension__ typedef __int128 WideInt;

}  // namespace siftwave::ledger::detail
