#include "main_window.h"

#include "batch_controller.h"
#include "decision_controller.h"
#include "export_figure_action.h"
#include "fit_controller.h"
#include "project_controller.h"
#include "transmission_controller.h"

#include "settings.h"

#include "project_session.h"
#include "widgets/common/background_task.h"
#include "widgets/common/drop_loading.h"
#include "widgets/common/sheet_chooser.h"
#include "widgets/findings/finding_model.h"
#include "widgets/findings/finding_review.h"
#include "widgets/fit/batch_fit.h"
#include "widgets/fit/fit_pane.h"
#include "widgets/ledger/decision_pane.h"
#include "widgets/ledger/ledger_view.h"
#include "widgets/nowcast/delay_view.h"
#include "widgets/plot/qcustomplot_include.h"

#include "siftwave/scan/scan.h"
#include "widgets/common/workbench.h"
#include "widgets/findings/region_browser.h"
#include "widgets/findings/region_model.h"
#include "widgets/plot/series_plot.h"
#include "widgets/plot/series_view.h"
#include "widgets/plot/transmission_panel.h"
#include "widgets/transmission/transmission_pane.h"

#include <QAction>
#include <QApplication>
#include <QCloseEvent>
#include <QComboBox>
#include <QDir>
#include <QDockWidget>
#include <QDragEnterEvent>
#include <QDropEvent>
#include <QFileDialog>
#include <QFileInfo>
#include <QKeySequence>
#include <QLabel>
#include <QLocale>
#include <QMenu>
#include <QMenuBar>
#include <QMessageBox>
#include <QMimeData>
#include <QProgressBar>
#include <QPushButton>
#include <QScrollArea>
#include <QSplitter>
#include <QStandardPaths>
#include <QStatusBar>
#include <QTextBrowser>
#include <QUndoStack>

#include <algorithm>
#include <array>
#include <cstdio>
#include <memory>

namespace siftwave::gui {

// The version of the dock arrangement saved in the settings: a layout saved under another
// (older) version is not restored, so a new default arrangement reaches every user once.
// 1: Findings moved under the plot, beside the Ledger.
// 2: the Transmission settings beside the Wave fit (the panel under the plot).
constexpr int kDockLayoutVersion = 2;

using widgets::BackgroundTask;

MainWindow::MainWindow(Options options, QWidget* parent)
    : QMainWindow(parent),
      m_options(options),
      m_workbench(new widgets::Workbench(this)),
      m_regionModel(new widgets::RegionModel(m_workbench, this)),
      m_browser(new widgets::RegionBrowser(m_regionModel)),
      m_plot(new widgets::SeriesPlot),
      m_release(new QTextBrowser),
      m_fitPane(new widgets::FitPane),
      m_findingModel(new widgets::FindingModel(m_workbench, this)),
      m_findings(new widgets::FindingReview(m_findingModel)),
      m_decisionPane(new widgets::DecisionPane),
      m_ledgerView(new widgets::LedgerView(m_workbench)),
      m_batchView(new widgets::BatchFitView),
      m_transmissionPanel(new widgets::TransmissionPanel),
      m_transmissionPane(new widgets::TransmissionPane),
      m_delayView(new widgets::DelayView),
      m_fitControl(new FitController(m_workbench, m_plot, m_fitPane, m_decisionPane, this)),
      m_decisionControl(
          new DecisionController(m_workbench, m_plot, m_decisionPane, options.dialogs, this)),
      m_projectControl(new ProjectController(m_workbench, m_plot, m_fitControl, this)),
      m_batchControl(new BatchController(m_workbench, m_plot, m_fitPane, m_batchView, this)),
      m_transmissionControl(new TransmissionController(m_workbench, m_plot, m_transmissionPanel,
                                                       m_transmissionPane, this)),
      m_dropLabel(new QLabel),
      m_sheetChooser(new widgets::SheetChooser),
      m_taskLabel(new QLabel),
      m_progress(new QProgressBar),
      m_cancel(new QPushButton(tr("Cancel"))) {
    setObjectName(QStringLiteral("mainWindow"));
    setWindowTitle(tr("Siftwave"));
    setAcceptDrops(true);
    setDockOptions(AnimatedDocks | AllowNestedDocks | AllowTabbedDocks);
    // The series plot over its time-aligned transmission panel (R_t or r(t)).
    auto* centre = new QSplitter(Qt::Vertical);
    centre->setObjectName(QStringLiteral("plotSplitter"));
    centre->addWidget(m_plot);
    centre->addWidget(m_transmissionPanel);
    centre->setStretchFactor(0, 2);
    centre->setStretchFactor(1, 1);
    centre->setCollapsible(0, false);
    setCentralWidget(centre);
    m_transmissionPanel->follow(m_plot->customPlot());

    buildDocks();
    buildActions();
    buildControllers();
    m_projectControl->setTransmission(m_transmissionControl);

    m_progress->setMaximumWidth(180);
    m_progress->setTextVisible(false);
    m_cancel->setObjectName(QStringLiteral("cancelTask"));
    statusBar()->addWidget(m_dropLabel, 1);
    statusBar()->addWidget(m_sheetChooser);
    statusBar()->addPermanentWidget(m_taskLabel);
    statusBar()->addPermanentWidget(m_progress);
    statusBar()->addPermanentWidget(m_cancel);
    setBusy(nullptr);
    connect(m_cancel, &QPushButton::clicked, this, &MainWindow::cancelBackgroundWork);
    // Another sheet of the same workbook is another drop: read it as one (its own ledger).
    connect(m_sheetChooser, &widgets::SheetChooser::sheetChosen, this,
            [this](const QString& sheet) {
                if (m_workbench->hasDrop())
                    startOpening(m_workbench->dropPath(), std::nullopt, sheet);
            });

    connectWidgets();

    resize(1360, 860);
    if (m_options.rememberLayout) {
        restoreGeometry(settings::windowGeometry());
        m_layoutRestored = restoreState(settings::windowState(), kDockLayoutVersion);
    }
    onDropChanged();
}

MainWindow::~MainWindow() = default;

// The window's own answers to what its widgets report (selection, measures, dragging,
// decisions asked for).
void MainWindow::connectWidgets() {
    connect(m_workbench, &widgets::Workbench::dropChanged, this, &MainWindow::onDropChanged);
    connect(m_browser, &widgets::RegionBrowser::regionSelected, this,
            &MainWindow::onRegionSelected);
    connect(m_plot, &widgets::SeriesPlot::measureChosen, this, [this](int measure) {
        m_regionModel->setMeasure(measure);
        redrawSeries();
    });
    connect(m_plot, &widgets::SeriesPlot::secondMeasureChosen, this,
            [this](int) { redrawSeries(); });
    connect(m_fitPane, &widgets::FitPane::optionsChanged, this,
            [this] { m_fitControl->refit(m_currentRegion, true); });
    connect(m_transmissionPane, &widgets::TransmissionPane::optionsChanged, this,
            [this] { m_transmissionControl->refresh(m_currentRegion); });
    connect(m_plot, &widgets::SeriesPlot::windowChanging, this,
            [this](widgets::DayIndexRange window) { onWindowDragged(window, false); });
    connect(m_plot, &widgets::SeriesPlot::windowChanged, this,
            [this](widgets::DayIndexRange window) { onWindowDragged(window, true); });
    connect(m_workbench, &widgets::Workbench::ledgerChanged, this, [this] {
        if (!m_decisionControl->isActive())
            redrawSeries();
    });
    connect(m_workbench, &widgets::Workbench::findingsChanged, this, [this] {
        if (!m_decisionControl->isActive())
            redrawSeries();
    });
    connect(m_findings, &widgets::FindingReview::findingSelected, this, [this](const QString& id) {
        if (m_decisionControl->isActive())
            return;  // finish or discard the decision first
        if (const scan::Finding* f = m_workbench->finding(id))
            focusPlotOn(*f);
    });
    connect(m_findings, &widgets::FindingReview::decideRequested, this,
            [this](const QString& id) { decideFinding(id); });
    connect(m_plot, &widgets::SeriesPlot::redistributeDayRequested, this,
            [this](int day) { decideDay(day); });
    connect(m_ledgerView, &widgets::LedgerView::withdrawRequested, this,
            [this](std::uint64_t sequence) { withdrawEntry(sequence); });
    connect(m_workbench, &widgets::Workbench::previousChanged, this, [this] {
        redrawSeries();
        updateReleaseSummary();
    });
    connect(m_batchView, &widgets::BatchFitView::regionActivated, this,
            [this](const QString& code) { selectRegion(code); });
}

// What the controllers ask of the window: errors shown, the plot focused, docks raised, the
// series redrawn, progress shown.
void MainWindow::buildControllers() {
    const auto raiseDock = [this](const char* name) {
        if (auto* dock = findChild<QDockWidget*>(QString::fromLatin1(name)))
            dock->raise();
    };
    connect(m_decisionControl, &DecisionController::errorOccurred, this, &MainWindow::showError);
    connect(m_decisionControl, &DecisionController::focusRequested, this, &MainWindow::focusPlotOn);
    connect(m_decisionControl, &DecisionController::decisionStarted, this, [this, raiseDock] {
        raiseDock("decisionDock");
        makeRoomForDecision();
    });
    connect(m_decisionControl, &DecisionController::decisionEnded, this, &MainWindow::redrawSeries);

    connect(m_projectControl, &ProjectController::errorOccurred, this, &MainWindow::showError);
    connect(m_projectControl, &ProjectController::openFailed, this,
            [this](const QString& title, const QString& message) {
                showError(title, message);
                Q_EMIT projectFailed(message);
            });
    connect(m_projectControl, &ProjectController::saved, this, [this](const QString& path) {
        if (m_options.rememberLayout) {
            settings::addRecentFile(path);
            rebuildRecentMenu();
        }
        updateWindowTitle();
        statusBar()->showMessage(tr("Project saved: %1").arg(path), 5000);
    });
    connect(m_projectControl, &ProjectController::regionRequested, this, &MainWindow::selectRegion);
    connect(m_projectControl, &ProjectController::redrawRequested, this, &MainWindow::redrawSeries);

    connect(m_batchControl, &BatchController::started, this,
            [this, raiseDock](BackgroundTask* task) {
                raiseDock("batchFitDock");
                setBusy(task);
            });
    connect(m_batchControl, &BatchController::finished, this, &MainWindow::batchFitFinished);
}

bool MainWindow::isBatchFitRunning() const {
    return m_batchControl->isRunning();
}

void MainWindow::startBatchFit() {
    m_batchControl->start();
}

double MainWindow::lastRefitMilliseconds() const {
    return m_fitControl->lastRefitMilliseconds();
}

const fit::FitResult* MainWindow::currentFit() const {
    return m_fitControl->currentFit();
}

QUndoStack* MainWindow::undoStack() const {
    return m_decisionControl->undoStack();
}

bool MainWindow::decideFinding(const QString& id) {
    return m_decisionControl->decideFinding(id);
}

bool MainWindow::decideDay(int day) {
    return m_decisionControl->decideDay(day);
}

bool MainWindow::applyCurrentDecision() {
    return m_decisionControl->apply();
}

bool MainWindow::withdrawEntry(std::uint64_t sequence, QString reason) {
    return m_decisionControl->withdraw(sequence, std::move(reason));
}

namespace {

/// A pane in a scroll area that follows the dock's width: when the docks of one column leave a
/// pane less height than its rows need (a long decision check below the fit pane, a small
/// screen), it scrolls instead of drawing its rows over each other, and its minimum height does
/// not hold the whole window taller than the screen.
QScrollArea* scrollable(QWidget* pane) {
    auto* area = new QScrollArea;
    area->setObjectName(pane->objectName() + QStringLiteral("Scroll"));
    area->setWidget(pane);
    area->setWidgetResizable(true);
    area->setFrameShape(QFrame::NoFrame);
    area->setHorizontalScrollBarPolicy(Qt::ScrollBarAlwaysOff);
    return area;
}

}  // namespace

void MainWindow::buildDocks() {
    auto* regions = new QDockWidget(tr("Regions"), this);
    regions->setObjectName(QStringLiteral("regionsDock"));
    regions->setWidget(m_browser);
    addDockWidget(Qt::LeftDockWidgetArea, regions);

    m_release->setObjectName(QStringLiteral("releaseSummary"));
    m_release->setOpenLinks(false);
    auto* release = new QDockWidget(tr("Release"), this);
    release->setObjectName(QStringLiteral("releaseDock"));
    release->setWidget(m_release);
    addDockWidget(Qt::BottomDockWidgetArea, release);

    m_fitPane->setObjectName(QStringLiteral("fitPane"));
    auto* fit = new QDockWidget(tr("Wave fit"), this);
    fit->setObjectName(QStringLiteral("fitDock"));
    fit->setWidget(scrollable(m_fitPane));
    addDockWidget(Qt::RightDockWidgetArea, fit);

    auto* transmissionDock = new QDockWidget(tr("Transmission"), this);
    transmissionDock->setObjectName(QStringLiteral("transmissionDock"));
    transmissionDock->setWidget(m_transmissionPane);
    addDockWidget(Qt::RightDockWidgetArea, transmissionDock);
    tabifyDockWidget(fit, transmissionDock);
    auto* delaysDock = new QDockWidget(tr("Reporting delays"), this);
    delaysDock->setObjectName(QStringLiteral("delaysDock"));
    delaysDock->setWidget(m_delayView);
    addDockWidget(Qt::RightDockWidgetArea, delaysDock);
    tabifyDockWidget(transmissionDock, delaysDock);
    fit->raise();

    m_findings->setObjectName(QStringLiteral("findingReview"));
    auto* findings = new QDockWidget(tr("Findings"), this);
    findings->setObjectName(QStringLiteral("findingsDock"));
    findings->setWidget(m_findings);

    m_decisionPane->setObjectName(QStringLiteral("decisionPane"));
    auto* decision = new QDockWidget(tr("Decision"), this);
    decision->setObjectName(QStringLiteral("decisionDock"));
    decision->setWidget(m_decisionPane);  // its preview and check scroll inside it
    addDockWidget(Qt::RightDockWidgetArea, decision);

    m_ledgerView->setObjectName(QStringLiteral("ledgerView"));
    auto* ledger = new QDockWidget(tr("Ledger"), this);
    ledger->setObjectName(QStringLiteral("ledgerDock"));
    ledger->setWidget(m_ledgerView);
    // The findings table has seven columns (a day range among them): it takes the bottom's
    // left part, where all of them fit at the default size; the ledger and its tabs the rest.
    addDockWidget(Qt::BottomDockWidgetArea, findings);
    splitDockWidget(findings, ledger, Qt::Horizontal);
    tabifyDockWidget(ledger, release);

    m_batchView->setObjectName(QStringLiteral("batchFitView"));
    auto* batch = new QDockWidget(tr("All regions"), this);
    batch->setObjectName(QStringLiteral("batchFitDock"));
    batch->setWidget(m_batchView);
    addDockWidget(Qt::BottomDockWidgetArea, batch);
    tabifyDockWidget(release, batch);
    ledger->raise();
}

// The menu bar, one menu a step.
void MainWindow::buildActions() {
    buildFileMenu();
    buildEditMenu();
    buildReviewMenu();
    buildViewMenu();
    buildHelpMenu();
}

// File: open a drop or a project, save the project, the previous release, recent drops, close,
// export and quit.
void MainWindow::buildFileMenu() {
    QMenu* file = menuBar()->addMenu(tr("&File"));
    QAction* open = file->addAction(tr("&Open drop…"), this, &MainWindow::showOpenDialog);
    open->setShortcut(QKeySequence::Open);
    open->setObjectName(QStringLiteral("actionOpenDrop"));
    addProjectActions(file);
    file->addSeparator();
    addPreviousReleaseActions(file);
    m_recentMenu = file->addMenu(tr("Open &recent"));
    rebuildRecentMenu();
    file->addSeparator();
    QAction* close = file->addAction(tr("&Close drop"), m_workbench, &widgets::Workbench::close);
    close->setShortcut(QKeySequence::Close);
    addExportFigureAction(this, file);
    file->addSeparator();
    QAction* quit = file->addAction(tr("&Quit"), this, &QWidget::close);
    quit->setShortcut(QKeySequence::Quit);
}

// Open project, Save project and Save project as (the saves enabled while a drop is open).
void MainWindow::addProjectActions(QMenu* file) {
    QAction* openProjectAction =
        file->addAction(tr("Open pro&ject…"), this, &MainWindow::showOpenProjectDialog);
    openProjectAction->setShortcut(QKeySequence(Qt::CTRL | Qt::SHIFT | Qt::Key_O));
    openProjectAction->setObjectName(QStringLiteral("actionOpenProject"));
    QAction* saveProjectAction =
        file->addAction(tr("&Save project"), this, &MainWindow::saveProjectInPlace);
    saveProjectAction->setShortcut(QKeySequence::Save);
    saveProjectAction->setObjectName(QStringLiteral("actionSaveProject"));
    saveProjectAction->setStatusTip(
        tr("Save the drop, its ledger, the previous release and this view as a project"));
    QAction* saveProjectAs =
        file->addAction(tr("Save project &as…"), this, &MainWindow::showSaveProjectDialog);
    saveProjectAs->setShortcut(QKeySequence::SaveAs);
    saveProjectAs->setObjectName(QStringLiteral("actionSaveProjectAs"));
    for (QAction* action : {saveProjectAction, saveProjectAs}) {
        action->setEnabled(false);
        connect(m_workbench, &widgets::Workbench::dropChanged, action,
                [this, action] { action->setEnabled(m_workbench->hasDrop()); });
    }
}

// Open and close the previous release (enabled with a drop open / a previous release shown).
void MainWindow::addPreviousReleaseActions(QMenu* file) {
    QAction* previous =
        file->addAction(tr("Open &previous release…"), this, &MainWindow::showOpenPreviousDialog);
    previous->setObjectName(QStringLiteral("actionOpenPrevious"));
    previous->setStatusTip(
        tr("Draw an earlier release of the same data over this one to see revisions"));
    QAction* history =
        file->addAction(tr("Open release &history…"), this, &MainWindow::showOpenHistoryDialog);
    history->setObjectName(QStringLiteral("actionOpenHistory"));
    history->setStatusTip(
        tr("Earlier releases of this series, one per period: the plot shows "
           "the nowcast of the last periods they give"));
    connect(m_workbench, &widgets::Workbench::dropChanged, this,
            [this, history] { history->setEnabled(m_workbench->hasDrop()); });
    history->setEnabled(false);
    QAction* closePrevious = file->addAction(tr("Close previous release"), this,
                                             [this] { m_workbench->setPreviousDrop(nullptr); });
    connect(m_workbench, &widgets::Workbench::dropChanged, this,
            [this, previous] { previous->setEnabled(m_workbench->hasDrop()); });
    connect(m_workbench, &widgets::Workbench::previousChanged, this, [this, closePrevious] {
        closePrevious->setEnabled(m_workbench->previousDrop() != nullptr);
    });
    connect(m_workbench, &widgets::Workbench::dropChanged, closePrevious,
            [closePrevious] { closePrevious->setEnabled(false); });
    previous->setEnabled(false);
    closePrevious->setEnabled(false);
}

// Edit: undo (a withdrawal) and redo through the decisions' undo stack.
void MainWindow::buildEditMenu() {
    QMenu* edit = menuBar()->addMenu(tr("&Edit"));
    QUndoStack* undoStack = m_decisionControl->undoStack();
    QAction* undo = undoStack->createUndoAction(this, tr("&Undo (appends a withdrawal)"));
    undo->setShortcut(QKeySequence::Undo);
    QAction* redo = undoStack->createRedoAction(this, tr("&Redo"));
    redo->setShortcut(QKeySequence::Redo);
    edit->addAction(undo);
    edit->addAction(redo);
}

// Review: the next open finding, decide it, apply or discard the decision.
void MainWindow::buildReviewMenu() {
    QMenu* review = menuBar()->addMenu(tr("&Review"));
    QAction* next =
        review->addAction(tr("&Next open finding"), this, [this] { m_findings->selectNextOpen(); });
    next->setShortcut(QKeySequence(Qt::CTRL | Qt::Key_J));
    QAction* decide = review->addAction(tr("&Decide the selected finding"), this, [this] {
        if (!m_findings->currentFinding().isEmpty())
            decideFinding(m_findings->currentFinding());
    });
    decide->setShortcut(QKeySequence(Qt::CTRL | Qt::Key_D));
    QAction* apply =
        review->addAction(tr("&Apply the decision"), this, [this] { applyCurrentDecision(); });
    apply->setShortcut(QKeySequence(Qt::CTRL | Qt::SHIFT | Qt::Key_Return));
    QAction* discard = review->addAction(tr("D&iscard the decision"), m_decisionControl,
                                         &DecisionController::discard);
    discard->setShortcut(QKeySequence(Qt::Key_Escape));
    // Off until the analyst asks: the completed series is an estimate, recorded as a decision.
    review->addSeparator();
    QAction* complete =
        review->addAction(tr("Use the &nowcast-completed counts…"), m_decisionControl,
                          &DecisionController::decideNowcastCompletion);
    complete->setObjectName(QStringLiteral("nowcastCompleteAction"));
    complete->setToolTip(
        tr("Prepare a ledger decision that adds the nowcast's reports still to "
           "come to the recent days of this case list; fits and figures then "
           "use the completed counts"));
}

// View: reset the plot, find a region, and show or hide each dock.
void MainWindow::buildViewMenu() {
    QMenu* view = menuBar()->addMenu(tr("&View"));
    view->addAction(tr("&Reset plot view"), m_plot, &widgets::SeriesPlot::resetView);
    QAction* find = view->addAction(tr("&Find region"), this, [this] {
        m_browser->searchBox()->setFocus();
        m_browser->searchBox()->selectAll();
    });
    find->setShortcut(QKeySequence::Find);
    view->addSeparator();
    for (QDockWidget* dock : findChildren<QDockWidget*>())
        view->addAction(dock->toggleViewAction());
}

// Help: about Siftwave, with what a fitted curve is not.
void MainWindow::buildHelpMenu() {
    QMenu* help = menuBar()->addMenu(tr("&Help"));
    help->addAction(tr("&About Siftwave"), this, [this] {
        QMessageBox::about(
            this, tr("About Siftwave"),
            tr("<p><b>Siftwave %1</b> — a workbench for surveillance case-count releases.</p>"
               "<p>A fitted curve describes reported counts under the assumption that "
               "conditions stayed constant; it is not a forecast to act on by itself. "
               "Defer to the responsible public-health authority and its methods.</p>")
                .arg(QApplication::applicationVersion()));
    });
}

QString MainWindow::askForDropFile(const QString& title) {
    QString start = m_options.rememberLayout ? settings::lastDirectory() : QString();
    const QString path = QFileDialog::getOpenFileName(
        this, title, start,
        tr("Data drops (*.csv *.tsv *.txt *.xlsx *.ods);;Workbooks (*.xlsx *.ods);;All files (*)"));
    if (!path.isEmpty() && m_options.rememberLayout)
        settings::setLastDirectory(QFileInfo(path).absolutePath());
    return path;
}

void MainWindow::showOpenDialog() {
    if (const QString path = askForDropFile(tr("Open a data drop")); !path.isEmpty())
        openDrop(path);
}

void MainWindow::showOpenPreviousDialog() {
    if (const QString path = askForDropFile(tr("Open the previous release")); !path.isEmpty())
        openPreviousRelease(path);
}

void MainWindow::openPreviousRelease(const QString& path) {
    if (m_task)
        m_task->cancel();
    widgets::LoadRequest request;
    request.dropPath = path;
    request.withRegister = false;
    const std::string expectedDrop =
        m_workbench->hasDrop() ? m_workbench->drop().source.sha256 : std::string();
    BackgroundTask* task = BackgroundTask::start(
        this, tr("Reading %1").arg(QFileInfo(path).fileName()),
        [request] { return widgets::loadDrop(request); },
        [this, path, expectedDrop](const widgets::LoadedDrop& loaded) {
            // Only for the drop it was asked for.
            if (!m_workbench->hasDrop() || m_workbench->drop().source.sha256 != expectedDrop)
                return;
            if (!loaded.ok()) {
                const QString message = widgets::describeError(*loaded.error);
                showError(tr("The previous release could not be read"), message);
                Q_EMIT dropFailed(message);
                return;
            }
            m_workbench->setPreviousDrop(loaded.drop);
            startScan();
            Q_EMIT previousOpened(path);
        });
    setBusy(task);
}

void MainWindow::rebuildRecentMenu() {
    m_recentMenu->clear();
    const QStringList files = m_options.rememberLayout ? settings::recentFiles() : QStringList();
    for (const QString& path : files) {
        QAction* action = m_recentMenu->addAction(QFileInfo(path).fileName(), this,
                                                  [this, path] { openFile(path); });
        action->setToolTip(path);
        action->setStatusTip(path);
        action->setEnabled(QFileInfo::exists(path));
    }
    if (files.isEmpty())
        m_recentMenu->addAction(tr("(none yet)"))->setEnabled(false);
    else {
        m_recentMenu->addSeparator();
        m_recentMenu->addAction(tr("Clear the list"), this, [this] {
            settings::clearRecentFiles();
            rebuildRecentMenu();
        });
    }
}

void MainWindow::openDrop(const QString& path) {
    startOpening(path, std::nullopt);
}

void MainWindow::openFile(const QString& path) {
    if (isProjectPath(path))
        openProject(path);
    else
        openDrop(path);
}

void MainWindow::startOpening(const QString& path,
                              std::optional<ProjectController::Opening> project,
                              const QString& sheet) {
    if (m_task)
        m_task->cancel();
    widgets::LoadRequest request;
    request.dropPath = path;
    request.options.sheet = project ? project->file.dropSheet : sheet.toStdString();
    if (project) {
        request.registerPath = resolvedProjectPath(project->path, project->file.registerPath);
        request.withRegister = !request.registerPath.isEmpty();
    }
    BackgroundTask* task = BackgroundTask::start(
        this, tr("Reading %1").arg(QFileInfo(path).fileName()),
        [request] { return widgets::loadDrop(request); },
        [this, path, project](const widgets::LoadedDrop& loaded) {
            auto fail = [this, &project](const QString& title, const QString& message) {
                showError(title, message);
                Q_EMIT dropFailed(message);
                if (project)
                    Q_EMIT projectFailed(message);
            };
            if (!loaded.ok()) {
                fail(project ? tr("The project's drop could not be read")
                             : tr("The drop could not be read"),
                     widgets::describeError(*loaded.error));
                return;
            }
            // A project's ledger belongs to one drop, named by its hash: a changed file would
            // replay someone else's decisions, so nothing is opened.
            if (project && loaded.drop->source.sha256 != project->file.dropSha256) {
                fail(tr("The project's drop has changed"),
                     tr("%1: the file's SHA-256 is %2, the project was saved with %3. The "
                        "project's ledger belongs to that release; open the file as a drop to "
                        "start a new ledger.")
                         .arg(path, QString::fromStdString(loaded.drop->source.sha256),
                              QString::fromStdString(project->file.dropSha256)));
                return;
            }
            m_decisionControl->reset();
            m_projectControl->setPath(project ? project->path : QString());
            m_workbench->setDrop(loaded.drop, loaded.regionRegister);
            const QString ledgerPath =
                project ? resolvedProjectPath(project->path, project->file.ledgerPath)
                        : ledgerPathFor(*loaded.drop);
            if (Status ledger = m_workbench->openLedger(ledgerPath); !ledger)
                showError(tr("The ledger of this drop cannot be used"),
                          widgets::describeError(ledger.error()));
            else if (project) {
                if (Status head = ledger::checkLedgerHead(project->file, m_workbench->ledger());
                    !head)
                    showError(tr("The project's ledger is not the one it was saved with"),
                              widgets::describeError(head.error()));
            }
            if (loaded.registerError)
                showError(tr("The region register could not be read"),
                          widgets::describeError(*loaded.registerError) +
                              tr("\n\nThe drop is open without region names."));
            if (m_options.rememberLayout) {
                settings::addRecentFile(project ? project->path
                                                : QFileInfo(path).absoluteFilePath());
                rebuildRecentMenu();
            }
            updateWindowTitle();
            Q_EMIT dropOpened(path);
            if (!project) {
                startScan();
                return;
            }
            showOpenedProject(*project);
        });
    setBusy(task);
}

void MainWindow::showOpenedProject(const ProjectController::Opening& project) {
    m_projectControl->restoreView(project.file);
    const QString previous = resolvedProjectPath(project.path, project.file.previousDropPath);
    const QString projectFile = project.path;
    const std::vector<ledger::ProjectRelease> history = project.file.releaseHistory;
    if (previous.isEmpty()) {
        startScan();
        openProjectHistory(projectFile, history);
        return;
    }
    // Opened with or without its previous release (a failure to read it is shown), then its
    // release history.
    auto waiting = std::make_shared<std::array<QMetaObject::Connection, 2>>();
    auto done = [this, projectFile, waiting, history] {
        for (const QMetaObject::Connection& c : *waiting)
            disconnect(c);
        openProjectHistory(projectFile, history);
    };
    (*waiting)[0] =
        connect(this, &MainWindow::previousOpened, this, [done](const QString&) { done(); });
    (*waiting)[1] =
        connect(this, &MainWindow::dropFailed, this, [done](const QString&) { done(); });
    openPreviousRelease(previous);
}

void MainWindow::updateWindowTitle() {
    if (!m_workbench->hasDrop()) {
        setWindowTitle(tr("Siftwave"));
        return;
    }
    QString drop = QFileInfo(m_workbench->dropPath()).fileName();
    if (const std::string& sheet = m_workbench->drop().source.sheet; !sheet.empty())
        drop = tr("%1 [%2]").arg(drop, QString::fromStdString(sheet));
    const QString project = m_projectControl->path();
    if (project.isEmpty())
        setWindowTitle(tr("%1 — Siftwave").arg(drop));
    else
        setWindowTitle(tr("%1 (%2) — Siftwave").arg(QFileInfo(project).fileName(), drop));
}

void MainWindow::cancelBackgroundWork() {
    if (m_task)
        m_task->cancel();
}

void MainWindow::setBusy(BackgroundTask* task) {
    m_task = task;
    const bool busy = task != nullptr;
    m_taskLabel->setVisible(busy);
    m_progress->setVisible(busy);
    m_cancel->setVisible(busy);
    if (!busy)
        return;
    m_taskLabel->setText(task->title());
    m_progress->setRange(0, 0);  // busy until the work reports how far it is
    connect(task, &BackgroundTask::progressChanged, m_progress, [this](int done, int total) {
        m_progress->setRange(0, total);
        m_progress->setValue(done);
    });
    connect(task, &BackgroundTask::finished, this, [this, task] {
        if (m_task == task)
            setBusy(nullptr);
    });
}

void MainWindow::showError(const QString& title, const QString& message) {
    std::fprintf(stderr, "siftwave: %s\n", qPrintable(message));
    if (!m_options.dialogs)
        return;
    auto* box = new QMessageBox(QMessageBox::Warning, title, message, QMessageBox::Ok, this);
    box->setObjectName(QStringLiteral("errorDialog"));
    box->setAttribute(Qt::WA_DeleteOnClose);
    box->setTextInteractionFlags(Qt::TextSelectableByMouse);
    box->open();  // window-modal, does not block the event loop
}

void MainWindow::onDropChanged() {
    QStringList measures;
    if (m_workbench->hasDrop()) {
        const Drop& drop = m_workbench->drop();
        for (const std::string& m : drop.measures)
            measures << QString::fromStdString(m);
        const QFileInfo info(m_workbench->dropPath());
        updateWindowTitle();
        m_sheetChooser->showSheetsOf(drop.source);
        const QString file =
            drop.source.sheet.empty()
                ? info.fileName()
                : tr("%1, sheet %2")
                      .arg(info.fileName(), QString::fromStdString(drop.source.sheet));
        m_dropLabel->setText(
            tr("%1 · %2 regions · %3 %4 to %5 · SHA-256 %6…")
                .arg(file)
                .arg(drop.regionCodes.size())
                .arg(QString::fromLatin1(cadenceName(drop.axis.cadence())),
                     QString::fromStdString(drop.axis.periodName(0)),
                     QString::fromStdString(drop.axis.periodName(drop.periods() - 1)),
                     QString::fromStdString(drop.source.sha256.substr(0, 12))));
    } else {
        m_projectControl->setPath(QString());
        updateWindowTitle();
        m_sheetChooser->clear();
        m_dropLabel->setText(
            tr("No drop open — File ▸ Open drop, or drop a CSV file or a workbook here"));
        m_delayView->clear();
    }
    m_plot->setMeasures(measures);
    updateReleaseSummary();
    // The browser selects the previous region again if the new drop has it; otherwise the first
    // one.
    if (m_workbench->hasDrop() && m_browser->currentRegion().isEmpty()) {
        const QString first = m_browser->firstRegionWithData();
        if (!first.isEmpty())
            m_browser->selectRegion(first);
    }
    if (!m_workbench->hasDrop())
        m_plot->setView(widgets::SeriesView{});
}

bool MainWindow::selectRegion(const QString& code) {
    return m_browser->selectRegion(code);
}

QString MainWindow::currentRegion() const {
    return m_currentRegion;
}

bool MainWindow::focusFinding(const QString& id) {
    if (!m_findings->selectFinding(id))
        return false;
    if (const scan::Finding* f = m_workbench->finding(id))
        focusPlotOn(*f);
    return true;
}

QString MainWindow::ledgerPathFor(const Drop& drop) const {
    QString folder = m_options.ledgerFolder;
    if (folder.isEmpty())
        folder = QStandardPaths::writableLocation(QStandardPaths::AppDataLocation) +
                 QStringLiteral("/ledgers");
    QDir().mkpath(folder);
    // The sheets of one workbook share its SHA-256 but are different drops: each sheet keeps
    // its own ledger ("<sha256>-sheet2.jsonl" for the workbook's second sheet).
    QString name = QString::fromStdString(drop.source.sha256);
    const auto& sheets = drop.source.sheets;
    if (const auto at = std::find(sheets.begin(), sheets.end(), drop.source.sheet);
        !drop.source.format.empty() && at != sheets.end())
        name += QStringLiteral("-sheet%1").arg(at - sheets.begin() + 1);
    return QDir(folder).filePath(name + QStringLiteral(".jsonl"));
}

void MainWindow::startScan() {
    if (!m_workbench->hasDrop())
        return;
    if (m_scanTask)
        m_scanTask->cancel();
    // The scan reads shared, immutable drops; the workbench keeps them alive for the task.
    auto drop = m_workbench->sharedDrop();
    // The previous release and the drop, or the release history ending with the drop: the
    // history holds the releases' shared drops, alive for the task.
    std::optional<ReleaseHistory> releases = m_workbench->comparedReleases();
    std::shared_ptr<const RegionRegister> regions;
    if (m_workbench->regionRegister())
        regions = std::make_shared<const RegionRegister>(*m_workbench->regionRegister());
    const std::string sha = drop->source.sha256;
    m_scanTask = BackgroundTask::start(
        this, tr("Scanning"),
        [drop, releases, regions] {
            scan::ScanContext context;
            context.history = releases ? &*releases : nullptr;
            context.regions = regions.get();
            return std::make_shared<Result<scan::ScanReport>>(scan::scanDrop(*drop, {}, context));
        },
        [this, sha](const std::shared_ptr<Result<scan::ScanReport>>& report) {
            if (!m_workbench->hasDrop() || m_workbench->drop().source.sha256 != sha)
                return;
            if (!*report) {
                showError(tr("The scan failed"), widgets::describeError(report->error()));
                Q_EMIT scanFinished();
                return;
            }
            m_workbench->setScanReport(
                std::make_shared<const scan::ScanReport>(std::move(*report).value()));
            Q_EMIT scanFinished();
        });
    if (!m_task)
        setBusy(m_scanTask);
}

void MainWindow::focusPlotOn(const scan::Finding& finding) {
    if (finding.region && finding.region->c_str() != m_currentRegion.toStdString())
        selectRegion(QString::fromStdString(*finding.region));
    if (finding.measure) {
        const auto measure = m_workbench->drop().measureIndex(*finding.measure);
        if (measure && static_cast<int>(*measure) != m_plot->measure()) {
            auto* box = m_plot->findChild<QComboBox*>(QStringLiteral("measureChoice"));
            if (box)
                box->setCurrentIndex(static_cast<int>(*measure));
        }
    }
    if (finding.first && finding.last) {
        const TimeAxis& axis = m_workbench->drop().axis;
        const int first = axis.periodOnGrid(*finding.first);
        const int last = axis.periodOnGrid(*finding.last);
        m_plot->focusOn(widgets::DayIndexRange{first - 21, last + 21});
    }
}

void MainWindow::onWindowDragged(widgets::DayIndexRange window, bool finished) {
    if (m_decisionControl->isActive()) {
        m_decisionPane->setWindow(window);  // previews through decisionEdited
        return;
    }
    m_fitControl->windowDragged(m_currentRegion, window, finished);
}

void MainWindow::onRegionSelected(const QString& code) {
    m_currentRegion = code;
    redrawSeries();
}

void MainWindow::redrawSeries() {
    const widgets::SeriesView view =
        m_workbench->seriesView(m_currentRegion, m_plot->measure(), m_plot->secondMeasure());
    // A register region without rows in this release draws nothing: the plot says why.
    m_plot->setView(view, m_workbench->hasDrop() && view.empty() ? m_currentRegion : QString());
    m_fitControl->refit(m_currentRegion, true);
    m_transmissionControl->refresh(m_currentRegion);
    updateDelayView();
}

// The reporting delays of the region in view (a case list), or why there are none.
void MainWindow::updateDelayView() {
    if (!m_workbench->hasDrop()) {
        m_delayView->clear();
        return;
    }
    const Drop& drop = m_workbench->drop();
    m_delayView->showDelays(drop, drop.regionIndex(m_currentRegion.toStdString()));
}

void MainWindow::updateReleaseSummary() {
    if (!m_workbench->hasDrop()) {
        m_release->setHtml(tr("<p><i>No drop open.</i></p>"));
        return;
    }
    const Drop& drop = m_workbench->drop();
    const Provenance& src = drop.source;
    const CellCounts cells = drop.countCells();
    auto row = [](const QString& label, const QString& value) {
        return QStringLiteral(
                   "<tr><td style='color:#555;padding-right:8px'>%1</td><td>%2</td></tr>")
            .arg(label, value);
    };
    auto text = [](const std::string& s) { return QString::fromStdString(s).toHtmlEscaped(); };
    const QLocale c = QLocale::c();
    QString delimiter =
        src.dialect.delimiter == '\t' ? tr("tab") : QString(QLatin1Char(src.dialect.delimiter));
    QStringList measures;
    for (const std::string& m : drop.measures)
        measures << QString::fromStdString(m).toHtmlEscaped();
    QStringList sheetNames;  // a workbook's sheets
    for (const std::string& s : src.sheets)
        sheetNames << text(s);
    QString html = QStringLiteral("<table cellspacing='0'>");
    html += row(tr("File"), text(src.path));
    html += row(tr("Size"), tr("%1 bytes").arg(c.toString(static_cast<qulonglong>(src.bytes))));
    html += row(tr("SHA-256"), QStringLiteral("<tt>%1</tt>").arg(text(src.sha256)));
    if (src.format.empty())
        html +=
            row(tr("Layout"), tr("%1, delimiter “%2”, %3")
                                  .arg(QString::fromLatin1(layoutName(src.layout)), delimiter,
                                       src.dialect.header ? tr("with header") : tr("no header")));
    else
        html += row(
            tr("Layout"),
            tr("%1, sheet “%2” of the %3 workbook (sheets: %4), table from column %5")
                .arg(QString::fromLatin1(layoutName(src.layout)), text(src.sheet), text(src.format),
                     sheetNames.join(QStringLiteral(", ")), text(columnLetters(src.firstColumn))));
    html += row(tr("Dates"), tr("%1 to %2 (%3 days, read as %4)")
                                 .arg(QString::fromStdString(drop.axis.first().iso()),
                                      QString::fromStdString(drop.axis.lastStart().iso()))
                                 .arg(drop.periods())
                                 .arg(text(src.dateFormat)));
    html += row(tr("Rows"), c.toString(static_cast<qulonglong>(drop.rows)));
    html += row(tr("Regions"), c.toString(static_cast<qulonglong>(drop.regionCodes.size())));
    html += row(tr("Measures"), measures.join(QStringLiteral(", ")));
    html += row(tr("Cells"), tr("%1 reported, %2 absent, %3 blank, %4 unparsable")
                                 .arg(c.toString(static_cast<qulonglong>(cells.reported)),
                                      c.toString(static_cast<qulonglong>(cells.absent)),
                                      c.toString(static_cast<qulonglong>(cells.blank)),
                                      c.toString(static_cast<qulonglong>(cells.unparsable))));
    html += row(tr("Duplicate rows"), c.toString(static_cast<qulonglong>(drop.duplicates.size())));
    if (const RegionRegister* reg = m_workbench->regionRegister())
        html += row(tr("Register"), text(reg->path));
    if (const Drop* previous = m_workbench->comparedPrevious())
        html += row(
            tr("Previous release"),
            tr("%1 (%2 to %3)%4")
                .arg(text(previous->source.path),
                     QString::fromStdString(previous->axis.first().iso()),
                     QString::fromStdString(previous->axis.lastStart().iso()),
                     m_workbench->previousDrop() ? QString() : tr(", from the release history")));
    html += QStringLiteral("</table>");
    if (!drop.warnings.empty()) {
        html += tr("<p><b>%1 warning(s) from the reader</b></p><ul>").arg(drop.warnings.size());
        const std::size_t shown = std::min<std::size_t>(drop.warnings.size(), 25);
        for (std::size_t i = 0; i < shown; ++i) {
            const Warning& w = drop.warnings[i];
            const QString where = QString::fromStdString(sourcePlace(src, w.line, w.column));
            html += QStringLiteral("<li>%1%2</li>")
                        .arg(where.isEmpty() ? QString() : where + QStringLiteral(": "),
                             text(w.message));
        }
        if (shown < drop.warnings.size())
            html += tr("<li>… and %1 more</li>").arg(drop.warnings.size() - shown);
        html += QStringLiteral("</ul>");
    }
    m_release->setHtml(html);
}

void MainWindow::showEvent(QShowEvent* event) {
    QMainWindow::showEvent(event);
    if (m_layoutRestored)
        return;
    m_layoutRestored = true;
    // The first arrangement (docks only size properly once the window has its size).
    auto* regions = findChild<QDockWidget*>(QStringLiteral("regionsDock"));
    auto* fit = findChild<QDockWidget*>(QStringLiteral("fitDock"));
    auto* findings = findChild<QDockWidget*>(QStringLiteral("findingsDock"));
    auto* ledger = findChild<QDockWidget*>(QStringLiteral("ledgerDock"));
    resizeDocks({regions, fit}, {width() * 27 / 100, width() * 28 / 100}, Qt::Horizontal);
    resizeDocks({findings, ledger}, {width() * 48 / 100, width() * 52 / 100}, Qt::Horizontal);
    resizeDocks({findings}, {height() * 26 / 100}, Qt::Vertical);
    resizeDocks({fit}, {height() * 56 / 100}, Qt::Vertical);  // the decision pane below it
}

void MainWindow::makeRoomForDecision() {
    // The Decision pane shares the right column with the Wave fit: while a decision is prepared
    // it gets the height its preview, check and buttons ask for, up to 60% of the column; the
    // fit pane scrolls if it must (it sits in a scroll area, see buildDocks(); the decision's
    // texts scroll inside its pane).
    auto* fit = findChild<QDockWidget*>(QStringLiteral("fitDock"));
    auto* decision = findChild<QDockWidget*>(QStringLiteral("decisionDock"));
    if (!fit || !decision || decision->isFloating() || fit->isFloating() ||
        dockWidgetArea(fit) != dockWidgetArea(decision))
        return;
    const int column = fit->height() + decision->height();
    auto* texts = m_decisionPane->findChild<QScrollArea*>(QStringLiteral("decisionTexts"));
    const int textsWanted = texts && texts->widget() ? texts->widget()->sizeHint().height() : 0;
    const int wanted =
        std::min(m_decisionPane->minimumSizeHint().height() + textsWanted + 24, column * 3 / 5);
    if (decision->height() >= wanted)
        return;
    resizeDocks({fit, decision}, {column - wanted, wanted}, Qt::Vertical);
}

void MainWindow::closeEvent(QCloseEvent* event) {
    if (m_options.rememberLayout) {
        settings::setWindowGeometry(saveGeometry());
        settings::setWindowState(saveState(kDockLayoutVersion));
    }
    QMainWindow::closeEvent(event);
}

void MainWindow::dragEnterEvent(QDragEnterEvent* event) {
    const QMimeData* mime = event->mimeData();
    if (mime->hasUrls() && !mime->urls().isEmpty() && mime->urls().front().isLocalFile())
        event->acceptProposedAction();
}

void MainWindow::dropEvent(QDropEvent* event) {
    const QList<QUrl> urls = event->mimeData()->urls();
    if (urls.isEmpty() || !urls.front().isLocalFile())
        return;
    event->acceptProposedAction();
    openFile(urls.front().toLocalFile());
}

}  // namespace siftwave::gui
