#pragma once
// The widgets the window and its controllers hold by pointer (widgets/<feature>/*.h).

namespace siftwave::widgets {
class BackgroundTask;
class BatchFitView;
class DelayView;
class DecisionPane;
class FindingModel;
class FindingReview;
class FitPane;
class LedgerView;
class RegionBrowser;
class RegionModel;
class SeriesPlot;
class SheetChooser;
class TransmissionPane;
class TransmissionPanel;
class Workbench;
}  // namespace siftwave::widgets
