// Dragging the fit window's edge in the workbench: what one mouse move costs, from the event to
// the plot's repaint on screen. The window is the real MainWindow (1400 x 900, the offscreen
// platform's software raster) on the bundled sample, region 1203, Gumbel least squares; each
// iteration moves the window's end by one day (back and forth over 30 days), so every step refits
// one model (no comparison while dragging, as in the GUI) and repaints.
//
// Counters (milliseconds per step, averages over the iterations):
//   refit_ms   MainWindow's refit: the core fit, the fit pane, the new curve handed to the plot
//   live_ms    the plot's repaint when it redrew the live layer alone (SeriesPlot)
//   replot_ms  QCustomPlot::replotTime() of a full replot, when one ran during the step
//   paint_ms   the QCustomPlot widget's paint event: its layer buffers drawn onto the window
//   full_replots  the share of steps that replotted every layer (the rest redrew one layer)
// The Time column is wall time, including the event loop; CPU is the GUI thread's time.
//
// BM_DragFitWindowEdge is the workbench as it is: a step redraws the plot's live layer alone.
// BM_DragFitWindowEdge_EveryLayer is the same drag with that layer made logical (no buffer of
// its own): QCPLayer::replot() then replots every layer, as every step did before the live
// layer, so the two compare on the same machine in the same run.
//
//   QT_QPA_PLATFORM=offscreen taskset -c 0 build/bench/window_drag_bench
#include "sample_window.h"
#include "widgets/plot/qcustomplot_include.h"
#include "widgets/plot/series_chart.h"
#include "widgets/plot/series_plot.h"

#include <QApplication>
#include <QElapsedTimer>
#include <QMouseEvent>
#include <QTemporaryDir>

#include <benchmark/benchmark.h>

#include <memory>

namespace {

using siftwave::gui::MainWindow;

// Counts and times the plot's paint events (the filter runs the paint itself to time it).
class PaintTimer : public QObject {
public:
    int paints = 0;
    double paintMs = 0;

protected:
    bool eventFilter(QObject* watched, QEvent* event) override {
        if (event->type() != QEvent::Paint || m_inside)
            return false;
        m_inside = true;
        QElapsedTimer clock;
        clock.start();
        watched->event(event);
        paintMs += static_cast<double>(clock.nsecsElapsed()) * 1e-6;
        ++paints;
        m_inside = false;
        return true;
    }

private:
    bool m_inside = false;
};

void sendMouse(QWidget* target, QEvent::Type type, QPointF pos, Qt::MouseButtons buttons) {
    QMouseEvent event(type, pos, target->mapToGlobal(pos), Qt::LeftButton, buttons, Qt::NoModifier);
    QCoreApplication::sendEvent(target, &event);
}

struct DragFixture {
    QTemporaryDir ledgers;
    std::unique_ptr<MainWindow> window;
    PaintTimer timer;
};

DragFixture* g_fixture = nullptr;  // opened in main(), before the benchmarks run

std::unique_ptr<DragFixture> openFixture() {
    auto f = std::make_unique<DragFixture>();
    siftwave::testing::SampleWindowOptions options;
    options.size = QSize(1400, 900);
    options.waitForExposed = true;
    f->window = siftwave::testing::openSampleWindow(f->ledgers.path(), options);
    if (!f->window || !f->window->selectRegion(QStringLiteral("1203")) || !f->window->currentFit())
        return nullptr;
    f->window->seriesPlot()->customPlot()->installEventFilter(&f->timer);
    QCoreApplication::processEvents();
    return f;
}

void dragFitWindowEdge(benchmark::State& state, QCPLayer::LayerMode liveLayerMode) {
    DragFixture* f = g_fixture;
    if (!f) {
        state.SkipWithError("the sample window did not open or 1203 has no fit");
        return;
    }
    siftwave::widgets::SeriesPlot* plot = f->window->seriesPlot();
    QCustomPlot* canvas = plot->customPlot();
    siftwave::widgets::SeriesChart* chart = plot->chart();
    chart->liveLayer()->setMode(liveLayerMode);
    canvas->replot();  // lays the axes out at the window's size, so pixels map to days
    QCoreApplication::processEvents();
    const int last = f->window->currentFit()->last;
    const double halfDay = (chart->pixelOfDayIndex(1) - chart->pixelOfDayIndex(0)) / 2;
    const double y = canvas->axisRect()->center().y();
    auto edgeOf = [&](int day) { return QPointF(chart->pixelOfDayIndex(day) + halfDay, y); };
    auto centreOf = [&](int day) { return QPointF(chart->pixelOfDayIndex(day), y); };

    sendMouse(canvas, QEvent::MouseButtonPress, edgeOf(last), Qt::LeftButton);
    int step = 0;
    int fullReplots = 0;
    int liveReplots = 0;
    double replotMs = 0;
    double liveMs = 0;
    double refitMs = 0;
    const int paintsBefore = f->timer.paints;
    const double paintMsBefore = f->timer.paintMs;
    for (auto _ : state) {
        // 0, -1, ..., -30, -29, ..., 0, -1, ...: a day per move, back and forth.
        const int phase = step++ % 60;
        const int day = last - (phase < 30 ? phase + 1 : 59 - phase);
        const int paints = f->timer.paints;
        const double replotBefore = canvas->replotTime();
        sendMouse(canvas, QEvent::MouseMove, centreOf(day), Qt::LeftButton);
        QElapsedTimer waited;
        waited.start();
        while (f->timer.paints == paints && waited.elapsed() < 2000)
            QCoreApplication::processEvents(QEventLoop::AllEvents);
        if (f->timer.paints == paints) {
            qWarning("step %d: window %d..%d, no repaint", step,
                     plot->editableWindow() ? plot->editableWindow()->first : -1,
                     plot->editableWindow() ? plot->editableWindow()->last : -1);
            state.SkipWithError("the plot did not repaint within 2 s of a move");
            break;
        }
        refitMs += f->window->lastRefitMilliseconds();
        // replotTime() changes (almost surely) when a full replot ran.
        if (canvas->replotTime() != replotBefore) {
            ++fullReplots;
            replotMs += canvas->replotTime();
        } else if (plot->lastRepaintWasLiveOnly()) {
            ++liveReplots;
            liveMs += plot->lastRepaintMs();
        }
    }
    // Back where it started, so the next run drags the same window.
    sendMouse(canvas, QEvent::MouseMove, centreOf(last), Qt::LeftButton);
    sendMouse(canvas, QEvent::MouseButtonRelease, centreOf(last), Qt::NoButton);
    QCoreApplication::processEvents();

    const double steps = static_cast<double>(state.iterations());
    state.counters["paint_ms"] = (f->timer.paintMs - paintMsBefore) / steps;
    state.counters["paints_per_step"] = (f->timer.paints - paintsBefore) / steps;
    state.counters["refit_ms"] = refitMs / steps;
    state.counters["live_ms"] = liveReplots > 0 ? liveMs / liveReplots : 0.0;
    state.counters["replot_ms"] = fullReplots > 0 ? replotMs / fullReplots : 0.0;
    state.counters["full_replots"] = fullReplots / steps;
}
void BM_DragFitWindowEdge(benchmark::State& state) {
    dragFitWindowEdge(state, QCPLayer::lmBuffered);
}
BENCHMARK(BM_DragFitWindowEdge)->Unit(benchmark::kMillisecond)->MinTime(2.0);

void BM_DragFitWindowEdge_EveryLayer(benchmark::State& state) {
    dragFitWindowEdge(state, QCPLayer::lmLogical);
    if (g_fixture)
        g_fixture->window->seriesPlot()->chart()->liveLayer()->setMode(QCPLayer::lmBuffered);
}
BENCHMARK(BM_DragFitWindowEdge_EveryLayer)->Unit(benchmark::kMillisecond)->MinTime(2.0);

}  // namespace

int main(int argc, char** argv) {
    if (qEnvironmentVariableIsEmpty("QT_QPA_PLATFORM"))
        qputenv("QT_QPA_PLATFORM", "offscreen");
    QApplication app(argc, argv);
    benchmark::Initialize(&argc, argv);
    if (benchmark::ReportUnrecognizedArguments(argc, argv))
        return 1;
    std::unique_ptr<DragFixture> fixture = openFixture();
    g_fixture = fixture.get();
    benchmark::RunSpecifiedBenchmarks();
    benchmark::Shutdown();
    g_fixture = nullptr;
    return 0;
}
