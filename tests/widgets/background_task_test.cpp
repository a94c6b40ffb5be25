// BackgroundTask: results reach a living receiver only, and never after cancel.
#include "widgets/common/background_task.h"

#include <QSignalSpy>
#include <QTest>

#include <atomic>
#include <memory>
#include <thread>

using siftwave::widgets::BackgroundTask;

class BackgroundTaskTest : public QObject {
    Q_OBJECT

private Q_SLOTS:
    void theResultArrivesOnTheReceiversThread() {
        QObject receiver;
        int result = 0;
        Qt::HANDLE thread = nullptr;
        BackgroundTask* task = BackgroundTask::start(
            &receiver, QStringLiteral("sum"),
            [] {
                int sum = 0;
                for (int i = 1; i <= 100; ++i)
                    sum += i;
                return sum;
            },
            [&](int value) {
                result = value;
                thread = QThread::currentThreadId();
            });
        QSignalSpy finished(task, &BackgroundTask::finished);
        QVERIFY(finished.wait(5000));
        QCOMPARE(result, 5050);  // Gauss: n(n+1)/2
        QCOMPARE(thread, QThread::currentThreadId());
    }

    void aDeadReceiverGetsNothing() {
        auto receiver = std::make_unique<QObject>();
        auto release = std::make_shared<std::atomic<bool>>(false);
        auto called = std::make_shared<bool>(false);
        BackgroundTask::start(
            receiver.get(), QStringLiteral("slow"),
            [release] {
                while (!*release)
                    std::this_thread::yield();
                return 1;
            },
            [called](int) { *called = true; });
        receiver.reset();  // the task dies with it
        *release = true;
        QTest::qWait(200);
        QVERIFY(!*called);
    }

    void cancelledWorkDeliversNothingButReportsFinished() {
        QObject receiver;
        auto release = std::make_shared<std::atomic<bool>>(false);
        bool called = false;
        BackgroundTask* task = BackgroundTask::start(
            &receiver, QStringLiteral("slow"),
            [release] {
                while (!*release)
                    std::this_thread::yield();
                return 1;
            },
            [&](int) { called = true; });
        QSignalSpy finished(task, &BackgroundTask::finished);
        task->cancel();
        QCOMPARE(finished.count(), 1);
        *release = true;
        QTest::qWait(200);
        QVERIFY(!called);
    }

    void progressReportedByTheWorkReachesTheGuiThread() {
        QObject receiver;
        auto release = std::make_shared<std::atomic<bool>>(false);
        BackgroundTask* task = BackgroundTask::start(
            &receiver, QStringLiteral("steps"),
            [release](BackgroundTask::Progress& progress) {
                progress.report(3, 10);
                while (!*release && !progress.cancelled())
                    std::this_thread::yield();
                return 0;
            },
            [](int) {});
        QSignalSpy progressed(task, &BackgroundTask::progressChanged);
        QVERIFY(progressed.wait(5000));
        QCOMPARE(progressed.last().at(0).toInt(), 3);
        QCOMPARE(progressed.last().at(1).toInt(), 10);
        *release = true;
    }
};

QTEST_MAIN(BackgroundTaskTest)
#include "background_task_test.moc"
