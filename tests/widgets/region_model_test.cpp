// RegionModel over the workbench: the open-findings column follows the ledger, and a change is
// announced with one dataChanged per group of sibling rows (a view re-measures its columns on
// each one, so one per row made opening a 3,000-region drop take over a minute).
#include "widgets/findings/region_model.h"
#include "sample_drop.h"
#include "widgets/common/workbench.h"

#include "siftwave/scan/scan.h"
#include "siftwave/scan/suggested_decision.h"

#include <QSignalSpy>
#include <QTemporaryDir>
#include <QTest>

using siftwave::widgets::RegionModel;
using siftwave::widgets::Workbench;

class RegionModelTest : public QObject {
    Q_OBJECT

private Q_SLOTS:
    void openFindingsFollowTheLedgerAndChangesComeInOneSignalPerGroup() {
        const siftwave::widgets::LoadedDrop loaded = siftwave::testing::loadSampleDrop();
        QVERIFY(loaded.ok());
        QVERIFY(loaded.regionRegister);
        Workbench workbench;
        RegionModel model(&workbench);
        workbench.setDrop(loaded.drop, loaded.regionRegister);
        QTemporaryDir folder;
        QVERIFY(workbench.openLedger(folder.filePath(QStringLiteral("l.jsonl"))).ok());
        auto report = siftwave::scan::scanDrop(*loaded.drop);
        QVERIFY(report.ok());
        workbench.setScanReport(
            std::make_shared<const siftwave::scan::ScanReport>(std::move(report).value()));

        // The row of 1306 (a district of a province) and its open findings.
        QModelIndex row1306;
        int groups = 1;  // the top level
        for (int p = 0; p < model.rowCount(); ++p) {
            const QModelIndex province = model.index(p, 0);
            if (model.rowCount(province) > 0)
                ++groups;
            for (int c = 0; c < model.rowCount(province); ++c)
                if (model.index(c, 0, province).data().toString() == QStringLiteral("1306"))
                    row1306 = model.index(c, RegionModel::OpenFindingsColumn, province);
        }
        QVERIFY(row1306.isValid());
        const int open = row1306.data().toInt();
        QVERIFY(open >= 1);  // manifest P11: a negative count in 1306's cases
        const siftwave::scan::Finding* negative = nullptr;
        for (const auto& f : workbench.findings())
            if (f.kind == siftwave::scan::FindingKind::NegativeCount && f.region == "1306")
                negative = &f;
        QVERIFY(negative);
        auto decision = siftwave::scan::suggestedDecision(*negative, "cases");
        QVERIFY(decision.ok());

        QSignalSpy changed(&model, &QAbstractItemModel::dataChanged);
        const auto entry = workbench.apply(*decision, QStringLiteral("test"));
        QVERIFY(entry.ok());
        QCOMPARE(row1306.data().toInt(), open - 1);
        QCOMPARE(changed.count(), groups);
        // Withdrawn: open again.
        QVERIFY(workbench.withdraw(*entry, QStringLiteral("test: undo")).ok());
        QCOMPARE(row1306.data().toInt(), open);
    }
};

QTEST_MAIN(RegionModelTest)
#include "region_model_test.moc"
