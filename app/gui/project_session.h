#pragma once
// The project file as the workbench uses it (the format is the core's,
// siftwave/ledger/project.h): where each file of a project is written down and
// found again, and where the project's own ledger lives.
//
// A project keeps its ledger beside it, "<name>.ledger.jsonl" next to
// "<name>.siftwave.json", so the folder can be moved or handed on as a whole.
// Saving a project whose drop's ledger still lives in the application's data
// folder copies that ledger there (atomically) and the workbench goes on with
// the copy; the original stays as it was. Paths inside the project's folder are
// stored relative to it, others absolute.

#include "siftwave/result.h"

#include <QString>

#include <string>

namespace siftwave::gui {

/// The file name ending of project files.
inline constexpr char kProjectSuffix[] = ".siftwave.json";

/// True when `path` names a project file (by its ending).
bool isProjectPath(const QString& path);

/// `path` with the project ending added when it has none.
QString withProjectSuffix(const QString& path);

/// Where a project keeps its ledger: "<name>.ledger.jsonl" beside "<name>.siftwave.json".
QString projectLedgerPath(const QString& projectPath);

/// How `file` is written into the project at `projectPath`: relative to the project's folder
/// when it lies inside it, else absolute. Empty stays empty.
std::string storedProjectPath(const QString& projectPath, const QString& file);

/// A path read from the project, made absolute (relative ones against the project's folder).
QString resolvedProjectPath(const QString& projectPath, const std::string& stored);

/// Gives the project at `projectPath` its own ledger: a copy of `currentLedger` (when that
/// file exists) at projectLedgerPath(), written atomically. Nothing is copied when the ledger
/// already is that file. Refuses to replace another ledger already there (an audit trail is
/// never overwritten). Returns the ledger path the workbench should use from now on.
Result<QString> adoptLedgerForProject(const QString& projectPath, const QString& currentLedger);

}  // namespace siftwave::gui
