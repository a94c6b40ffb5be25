#pragma once
// Where the bundled sample drop is: the source tree's samples/ folder when run
// from a build tree, else <prefix>/share/siftwave/samples beside an installed binary.

#include <QString>

namespace siftwave::gui {

/// The samples folders to look in, in order.
QStringList sampleFolders();
/// The current release of the bundled sample scenario; empty when none is found.
QString bundledSampleDrop();

}  // namespace siftwave::gui
