// The region browser's name column is narrow in its dock, so long names are elided
// ("Merrow..."): the row's tooltip gives the code and the name in full.
#include "sample_drop.h"
#include "widgets/common/workbench.h"
#include "widgets/findings/region_model.h"

#include <QTest>

using siftwave::widgets::RegionModel;
using siftwave::widgets::Workbench;

class RegionTooltipTest : public QObject {
    Q_OBJECT

private Q_SLOTS:
    void theTooltipGivesTheFullName() {
        const siftwave::widgets::LoadedDrop loaded = siftwave::testing::loadSampleDrop();
        QVERIFY(loaded.ok());
        QVERIFY(loaded.regionRegister);
        Workbench workbench;
        RegionModel model(&workbench);
        workbench.setDrop(loaded.drop, loaded.regionRegister);

        QModelIndex row1306;
        for (int p = 0; p < model.rowCount(); ++p) {
            const QModelIndex province = model.index(p, 0);
            for (int c = 0; c < model.rowCount(province); ++c)
                if (model.index(c, 0, province).data().toString() == QStringLiteral("1306"))
                    row1306 = model.index(c, RegionModel::NameColumn, province);
        }
        QVERIFY(row1306.isValid());
        // samples/quenmara_regions.csv: 1306,Merrowdale,BR
        QCOMPARE(row1306.data().toString(), QStringLiteral("Merrowdale"));
        const QString tip = row1306.data(Qt::ToolTipRole).toString();
        QVERIFY2(tip.startsWith(QStringLiteral("1306 Merrowdale: ")), qPrintable(tip));
        QVERIFY2(tip.contains(QStringLiteral("reported days")), qPrintable(tip));
    }
};

QTEST_MAIN(RegionTooltipTest)
#include "region_tooltip_test.moc"
