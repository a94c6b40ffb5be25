#pragma once
// Long work (open, scan, batch fit) off the GUI thread.
//
// BackgroundTask::start() runs `work` on Qt's thread pool and calls `done` with
// its result on the receiver's thread — only while the receiver is alive (the
// task is the receiver's child, so it dies with it) and only when the task was
// not cancelled. Cancelling stops waiting at once; work that cannot be
// interrupted finishes on its thread and its result is dropped.
//
// Work that can report progress takes a `BackgroundTask::Progress&` and calls
// report(done, total) and cancelled() as it goes; the task polls it from the
// GUI thread (a few times a second) and emits progressChanged().

#include <QFutureWatcher>
#include <QObject>
#include <QString>
#include <QTimer>
#include <QtConcurrent/QtConcurrentRun>

#include <atomic>
#include <memory>
#include <type_traits>
#include <utility>

namespace siftwave::widgets {

class BackgroundTask : public QObject {
    Q_OBJECT

public:
    /// Shared between the worker and the task; safe to use from the worker thread.
    class Progress {
    public:
        void report(int done, int total) {
            m_total = total;
            m_done = done;
        }
        bool cancelled() const { return m_cancelled; }

    private:
        friend class BackgroundTask;
        std::atomic<int> m_done{0};
        std::atomic<int> m_total{0};
        std::atomic<bool> m_cancelled{false};
    };

    /// Starts `work` (callable as work() or work(Progress&)); `done(result)` runs on
    /// the receiver's thread unless the receiver died or the task was cancelled.
    template <class Work, class Done>
    static BackgroundTask* start(QObject* receiver, const QString& title, Work work, Done done) {
        auto* task = new BackgroundTask(receiver, title);
        auto progress = task->m_progress;
        auto run = [work = std::move(work), progress]() mutable {
            if constexpr (std::is_invocable_v<Work&, Progress&>)
                return work(*progress);
            else
                return work();
        };
        using T = decltype(run());
        auto* watcher = new QFutureWatcher<T>(task);
        QObject::connect(watcher, &QFutureWatcherBase::finished, task,
                         [task, watcher, done = std::move(done)]() mutable {
                             if (!task->m_progress->cancelled())
                                 done(watcher->result());
                             task->finish();
                         });
        watcher->setFuture(QtConcurrent::run(std::move(run)));
        return task;
    }

    QString title() const { return m_title; }
    bool isCancelled() const { return m_progress->cancelled(); }
    /// Stops waiting for the result; `done` will not be called.
    void cancel();

Q_SIGNALS:
    void progressChanged(int done, int total);
    /// Emitted once, whether the work completed or was cancelled; the task then deletes itself.
    void finished();

private:
    BackgroundTask(QObject* receiver, const QString& title);
    void finish();
    void pollProgress();

    QString m_title;
    QTimer m_poll;
    int m_lastDone = -1;
    int m_lastTotal = -1;
    std::shared_ptr<Progress> m_progress;
    bool m_finished = false;
};

}  // namespace siftwave::widgets
