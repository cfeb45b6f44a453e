// The demo team of the fictional Harbourlight Decision Lab, one account per study role.
// Shared by the seeder (db/seeders/01-demo-team.ts), the start banner and the browser tests.
export const demoGroup = 'Harbourlight Decision Lab';

export const demoAccounts = [
  { role: 'owner', name: 'Rowan Tillery', email: 'rowan.owner@example.org', password: 'harbour-owner-2026' },
  { role: 'editor', name: 'Emery Calloway', email: 'emery.editor@example.org', password: 'harbour-editor-2026' },
  { role: 'operator', name: 'Oakley Brandt', email: 'oakley.operator@example.org', password: 'harbour-operator-2026' },
  { role: 'viewer', name: 'Vesper Lindqvist', email: 'vesper.viewer@example.org', password: 'harbour-viewer-2026' },
];
