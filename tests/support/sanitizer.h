#pragma once
// SIFTWAVE_TEST_UNDER_ASAN: 1 when the test is built with AddressSanitizer, which reserves
// terabytes of address space for its shadow memory, so that an address-space limit (ulimit -v)
// in a test's harness cannot be applied there. GCC defines __SANITIZE_ADDRESS__; clang answers
// __has_feature.
#if defined(__SANITIZE_ADDRESS__)
#define SIFTWAVE_TEST_UNDER_ASAN 1
#elif defined(__has_feature)
#if __has_feature(address_sanitizer)
#define SIFTWAVE_TEST_UNDER_ASAN 1
#endif
#endif
#ifndef SIFTWAVE_TEST_UNDER_ASAN
#define SIFTWAVE_TEST_UNDER_ASAN 0
#endif
