#pragma once
// QCustomPlot's header uses the Qt keywords (signals, foreach) that our targets
// switch off with QT_NO_KEYWORDS. Include it through this file only: the
// keywords are mapped to their Q_ macros for the header and removed after it.

#if defined(QT_NO_KEYWORDS)
#define signals Q_SIGNALS
#define slots Q_SLOTS
#define emit Q_EMIT
#define foreach Q_FOREACH
#include <qcustomplot.h>
#undef signals
#undef slots
#undef emit
#undef foreach
#else
#include <qcustomplot.h>
#endif
