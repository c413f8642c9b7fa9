import type { ComponentType } from 'react';
import { demoLoad } from '../features/import/demo-load';
import { ImportView } from '../features/import/ImportView';
import { ExportView } from '../features/export/ExportView';
import { RestoreBackup } from '../features/settings/RestoreBackup';
import { SettingsView } from '../features/settings/SettingsView';

/** The per-project screens, composed here so features never import each other. */
export interface ProjectViewProps {
  projectId: number;
}

export const projectViews: {
  import: ComponentType<ProjectViewProps>;
  export: ComponentType<ProjectViewProps>;
  settings: ComponentType<ProjectViewProps>;
  demoLoad: (() => Promise<number>) | undefined;
  restore: ComponentType<{ onOpen: (projectId: number) => void }>;
} = {
  import: ImportView,
  export: ExportView,
  settings: SettingsView,
  demoLoad,
  restore: RestoreBackup,
};
