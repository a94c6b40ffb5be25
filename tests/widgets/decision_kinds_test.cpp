// The other preview-then-apply kinds through the widgets: fill missing days, resolve a duplicate
// row, merge a code variant. Each goes finding -> Decide -> preview -> reason -> Apply, and is
// checked against the ledger entry, the totals the kind must keep (or state), and undo.
// The planted problems are those of samples/manifest.json (P04, P12, P14).
#include "main_window.h"
#include "sample_window.h"

#include "widgets/common/workbench.h"
#include "widgets/findings/finding_review.h"
#include "widgets/ledger/decision_pane.h"

#include "siftwave/ledger/replay.h"

#include <QComboBox>
#include <QLineEdit>
#include <QPushButton>
#include <QSignalSpy>
#include <QStandardPaths>
#include <QTemporaryDir>
#include <QTest>
#include <QUndoStack>

using siftwave::gui::MainWindow;

namespace {

const siftwave::scan::Finding* findingOf(const siftwave::widgets::Workbench& wb,
                                         siftwave::scan::FindingKind kind,
                                         const std::string& region,
                                         const std::string& measure = {}) {
    for (const auto& f : wb.findings())
        if (f.kind == kind && f.region && *f.region == region &&
            (measure.empty() || !f.measure || *f.measure == measure))
            return &f;
    return nullptr;
}

siftwave::Date day(const char* iso) {
    return *siftwave::Date::fromIso(iso);
}

}  // namespace

class DecisionKindsTest : public QObject {
    Q_OBJECT

    QTemporaryDir m_ledgers;
    std::unique_ptr<MainWindow> m_window;

    // Finding -> Decide button -> preview accepted -> typed reason -> Apply button.
    bool decideThroughTheWidgets(const siftwave::scan::Finding& finding, const QString& reason,
                                 const QString& method = {}) {
        MainWindow& window = *m_window;
        if (!window.findingReview()->selectFinding(QString::fromStdString(finding.id)))
            return false;
        auto* decide =
            window.findingReview()->findChild<QPushButton*>(QStringLiteral("decideFinding"));
        if (!decide || !decide->isEnabled())
            return false;
        QTest::mouseClick(decide, Qt::LeftButton);
        siftwave::widgets::DecisionPane* pane = window.decisionPane();
        if (!pane->isActive())
            return false;
        if (!method.isEmpty()) {
            auto* box = pane->findChild<QComboBox*>(QStringLiteral("decisionMethod"));
            const int index = box ? box->findText(method) : -1;
            if (index < 0)
                return false;
            box->setCurrentIndex(index);  // previews again through decisionEdited
        }
        if (!pane->previewOk())
            return false;
        auto* field = pane->findChild<QLineEdit*>(QStringLiteral("decisionReason"));
        auto* apply = pane->findChild<QPushButton*>(QStringLiteral("applyDecision"));
        field->clear();
        QTest::keyClicks(field, reason);
        if (!apply->isEnabled())
            return false;
        const std::size_t before = window.workbench()->ledger().entries.size();
        QTest::mouseClick(apply, Qt::LeftButton);
        return window.workbench()->ledger().entries.size() == before + 1 && !pane->isActive();
    }

private Q_SLOTS:
    void init() {
        QVERIFY(m_ledgers.isValid());
        m_window = siftwave::testing::openSampleWindow(m_ledgers.path());
        QVERIFY(m_window);
    }
    void cleanup() { m_window.reset(); }

    void missingDaysAreFilledAndTheTotalChangesByExactlyTheFilledCounts() {
        siftwave::widgets::Workbench& wb = *m_window->workbench();
        const auto& drop = wb.drop();
        // manifest P12: no rows for 1310 from 2026-07-13 to 2026-07-16.
        const auto* gap = findingOf(wb, siftwave::scan::FindingKind::MissingDates, "1310", "cases");
        QVERIFY(gap);
        QCOMPARE(*gap->first, day("2026-07-13"));
        QCOMPARE(*gap->last, day("2026-07-16"));
        const std::size_t region = *drop.regionIndex("1310");
        const std::size_t cases = *drop.measureIndex("cases");
        const int first = day("2026-07-13") - drop.axis.first();
        for (int d = first; d < first + 4; ++d)
            QVERIFY(!drop.cell(cases, region, d).reported());
        const std::int64_t totalBefore = *wb.cleanedTotal(QStringLiteral("1310"), int(cases));

        QVERIFY(decideThroughTheWidgets(*gap, QStringLiteral("four days lost in transfer (test)"),
                                        QStringLiteral("linear")));
        const siftwave::ledger::LedgerEntry& entry = wb.ledger().entries.back();
        QCOMPARE(entry.decision.kind, siftwave::ledger::DecisionKind::FillMissing);
        QCOMPARE(entry.decision.fillMethod, siftwave::ledger::FillMethod::Linear);
        QCOMPARE(QString::fromStdString(entry.decision.finding), QString::fromStdString(gap->id));
        QCOMPARE(entry.reason, std::string("four days lost in transfer (test)"));
        // Linear filling states its change: the total moves by the sum of the four new values,
        // no more and no less, and every other region keeps its total.
        std::int64_t filled = 0;
        for (int d = first; d < first + 4; ++d) {
            const auto& cell = wb.cleaned().cell(cases, region, d);
            QVERIFY(cell.hasValue());
            QVERIFY(cell.value >= 0);
            filled += cell.value;
        }
        QVERIFY(filled > 0);
        QCOMPARE(*wb.cleanedTotal(QStringLiteral("1310"), int(cases)), totalBefore + filled);
        for (const siftwave::ledger::TotalChange& t : entry.effect.totals)
            if (t.region == "1310" && t.measure == "cases")
                QCOMPARE(t.change(), filled);
        for (std::size_t r = 0; r < drop.regionCodes.size(); ++r)
            if (r != region)
                QCOMPARE(wb.cleaned().total(cases, r), siftwave::ledger::rawTotal(drop, cases, r));
        QVERIFY(wb.chainOk());

        m_window->undoStack()->undo();
        QCOMPARE(wb.ledger().entries.back().decision.kind,
                 siftwave::ledger::DecisionKind::Withdraw);
        for (int d = first; d < first + 4; ++d)
            QVERIFY(!wb.cleaned().cell(cases, region, d).hasValue());
        QCOMPARE(*wb.cleanedTotal(QStringLiteral("1310"), int(cases)), totalBefore);
    }

    void aDuplicateRowIsResolvedByTheChosenRule() {
        siftwave::widgets::Workbench& wb = *m_window->workbench();
        const auto& drop = wb.drop();
        // manifest P04: 1207's row of 2026-05-30 appears twice with the same values (cases 18).
        const auto* duplicate =
            findingOf(wb, siftwave::scan::FindingKind::DuplicateRow, "1207", "cases");
        QVERIFY(duplicate);
        const std::size_t region = *drop.regionIndex("1207");
        const std::size_t cases = *drop.measureIndex("cases");
        const int d = day("2026-05-30") - drop.axis.first();
        QCOMPARE(drop.cell(cases, region, d).value, 18);
        const std::int64_t raw = siftwave::ledger::rawTotal(drop, cases, region);

        // "first" (the suggestion, the rows agree) keeps the value and the total.
        QVERIFY(decideThroughTheWidgets(*duplicate, QStringLiteral("the same row sent twice"),
                                        QStringLiteral("first")));
        QCOMPARE(wb.ledger().entries.back().decision.kind,
                 siftwave::ledger::DecisionKind::ResolveDuplicate);
        QCOMPARE(wb.cleaned().cell(cases, region, d).value, 18);
        QCOMPARE(wb.cleaned().total(cases, region), raw);
        m_window->undoStack()->undo();

        // "sum" counts both rows: 18 + 18, and the total says +18.
        QVERIFY(decideThroughTheWidgets(*duplicate,
                                        QStringLiteral("two sites reporting (test of sum)"),
                                        QStringLiteral("sum")));
        const siftwave::ledger::LedgerEntry& entry = wb.ledger().entries.back();
        QCOMPARE(entry.decision.duplicateRule, siftwave::ledger::DuplicateRule::Sum);
        QCOMPARE(wb.cleaned().cell(cases, region, d).value, 36);
        QCOMPARE(wb.cleaned().total(cases, region), raw + 18);
        QVERIFY(wb.chainOk());

        m_window->undoStack()->undo();
        QCOMPARE(wb.cleaned().cell(cases, region, d).value, 18);
        QCOMPARE(wb.cleaned().total(cases, region), raw);
    }

    void aCodeVariantIsMergedIntoItsCanonicalCodeKeepingTheSum() {
        siftwave::widgets::Workbench& wb = *m_window->workbench();
        const auto& drop = wb.drop();
        // manifest P14: Skaldrin's last week written as 412 instead of 0412.
        const auto* variant = findingOf(wb, siftwave::scan::FindingKind::CodeVariant, "412");
        QVERIFY(variant);
        const std::size_t into = *drop.regionIndex("0412");
        const std::size_t from = *drop.regionIndex("412");
        std::vector<std::int64_t> sums;
        for (std::size_t m = 0; m < drop.measures.size(); ++m)
            sums.push_back(siftwave::ledger::rawTotal(drop, m, into) +
                           siftwave::ledger::rawTotal(drop, m, from));
        const int lastWeek = day("2026-11-23") - drop.axis.first();
        QVERIFY(!drop.cell(0, into, lastWeek).reported());
        QVERIFY(drop.cell(0, from, lastWeek).reported());

        QVERIFY(
            decideThroughTheWidgets(*variant, QStringLiteral("412 is Skaldrin without its zero")));
        const siftwave::ledger::LedgerEntry& entry = wb.ledger().entries.back();
        QCOMPARE(entry.decision.kind, siftwave::ledger::DecisionKind::MergeCodes);
        QCOMPARE(entry.decision.variant, std::string("412"));
        QCOMPARE(entry.decision.into, std::string("0412"));
        for (std::size_t m = 0; m < drop.measures.size(); ++m) {
            QCOMPARE(wb.cleaned().total(m, into), sums[m]);  // the two codes' sum, in one
            QCOMPARE(wb.cleaned().total(m, from), std::int64_t(0));
        }
        QCOMPARE(wb.cleaned().cell(0, into, lastWeek).value,
                 static_cast<std::int64_t>(drop.cell(0, from, lastWeek).value));
        QVERIFY(wb.chainOk());

        m_window->undoStack()->undo();
        for (std::size_t m = 0; m < drop.measures.size(); ++m) {
            QCOMPARE(wb.cleaned().total(m, into), siftwave::ledger::rawTotal(drop, m, into));
            QCOMPARE(wb.cleaned().total(m, from), siftwave::ledger::rawTotal(drop, m, from));
        }
        QVERIFY(!wb.cleaned().cell(0, into, lastWeek).hasValue());
    }
};

QTEST_MAIN(DecisionKindsTest)
#include "decision_kinds_test.moc"
