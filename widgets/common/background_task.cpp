#include "widgets/common/background_task.h"

namespace siftwave::widgets {

BackgroundTask::BackgroundTask(QObject* receiver, const QString& title)
    : QObject(receiver), m_title(title), m_progress(std::make_shared<Progress>()) {
    m_poll.setInterval(150);
    connect(&m_poll, &QTimer::timeout, this, &BackgroundTask::pollProgress);
    m_poll.start();
}

void BackgroundTask::pollProgress() {
    const int done = m_progress->m_done;
    const int total = m_progress->m_total;
    if (done == m_lastDone && total == m_lastTotal)
        return;
    m_lastDone = done;
    m_lastTotal = total;
    Q_EMIT progressChanged(done, total);
}

void BackgroundTask::cancel() {
    if (m_finished)
        return;
    m_progress->m_cancelled = true;
    finish();
}

void BackgroundTask::finish() {
    if (m_finished)
        return;
    m_finished = true;
    m_poll.stop();
    Q_EMIT finished();
    deleteLater();
}

}  // namespace siftwave::widgets
