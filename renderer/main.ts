/**
 * Daybreak's renderer entry: connects to the host, makes sure the demo scenario exists (with
 * progress), and opens it.
 */
import './style.css';
import { connectHost } from './host';
import { SCAN_PRESET_SETTINGS, type Dataset, type HostApi, type ScanPresetSetting } from '../electron/contract';
import { CAUTION } from '../core/caution';
import { Desk } from './desk';
import { CancelledError } from './data/session';
import { el } from './dom';

const host: HostApi = connectHost();
const app = document.getElementById('app')!;


const mainArea = el('main');
const statusText = el('span', { className: 'status' });
const themeButton = el('button', { title: 'Switch between light and dark' }, 'Theme');
const aboutButton = el('button', {}, 'About');
const settingsButton = el('button', { title: 'Analyst name and agency written into exports' }, 'Settings');
settingsButton.addEventListener('click', () => void openSettings());
document.documentElement.dataset.theme = localStorage.getItem('daybreak.theme') ?? 'dark';
themeButton.addEventListener('click', () => {
  const next = document.documentElement.dataset.theme === 'dark' ? 'light' : 'dark';
  document.documentElement.dataset.theme = next;
  localStorage.setItem('daybreak.theme', next);
});
function folderForm(): HTMLFormElement {
  const input = el('input', { type: 'text', placeholder: 'Open a data folder (path)\u2026', size: 36, name: 'folder' });
  const form = el('form', { className: 'folder-form' }, input);
  form.addEventListener('submit', (e) => {
    e.preventDefault();
    if (input.value.trim()) void openFolder(input.value.trim());
  });
  return form;
}

const about = el('dialog', { id: 'about' },
  el('h2', {}, 'Daybreak'),
  el('p', {}, 'Review of a seismic network\u2019s overnight triggers: picks, locations, QuakeML.'),
  el('p', { className: 'caution-text' }, CAUTION),
  el('form', { method: 'dialog' }, el('button', {}, 'Close')));
aboutButton.addEventListener('click', () => about.showModal());

app.append(
  el('header', { className: 'bar' },
    el('h1', {}, el('span', { className: 'sun' }, '\u25d2 '), 'Daybreak'),
    folderForm(), statusText,
    el('span', { className: 'spacer' }), settingsButton, themeButton, aboutButton),
  mainArea,
  el('footer', { className: 'caution' }, CAUTION),
  about,
);

async function openDemo(): Promise<void> {
  const card = el('div', { className: 'card' }, el('h2', {}, 'Demo scenario'));
  const bar = el('div', { className: 'progress' }, el('div'));
  const msg = el('p', {}, 'Checking the demo scenario\u2026');
  card.append(msg, bar);
  mainArea.replaceChildren(card);
  let status = await host.call('demo.ensure', {});
  while (status.ok && status.value.state === 'generating') {
    msg.textContent = `Creating the invented demo night: ${status.value.message}`;
    (bar.firstChild as HTMLDivElement).style.width = `${Math.round(status.value.progress * 100)}%`;
    await new Promise((r) => setTimeout(r, 250));
    status = await host.call('demo.status', {});
  }
  if (!status.ok || status.value.state !== 'ready') {
    const why = status.ok ? status.value.message : status.message;
    card.append(el('p', { className: 'error' }, `The demo scenario could not be made: ${why}`));
    return;
  }
  const ds = await host.call('dataset.open', { root: status.value.root });
  if (!ds.ok) {
    card.append(el('p', { className: 'error' }, `Could not open ${status.value.root}: ${ds.message}`));
    return;
  }
  showDataset(ds.value);
}

let desk: Desk | null = null;

const SCAN_PRESET_LABELS: Record<ScanPresetSetting, string> = {
  auto: 'automatic, from the network\u2019s size',
  local: 'local earthquakes (2\u201315 Hz)',
  near: 'near-source: mines, dams, injection sites (5\u2013150 Hz)',
};

async function openSettings(): Promise<void> {
  const current = await host.call('settings.get', {});
  if (!current.ok) { statusText.textContent = current.message; return; }
  const field = (label: string, name: string, value: string, hint: string) =>
    el('label', { className: 'setting' }, el('span', {}, label), el('input', { type: 'text', name, value, size: 32 }), el('small', { className: 'muted' }, hint));
  const form = el('form', { method: 'dialog' },
    el('h2', {}, 'Settings'),
    field('Analyst', 'analyst', current.value.analyst, 'written as creationInfo/author'),
    field('Agency', 'agency', current.value.agency, 'written as creationInfo/agencyID'),
    field('Identifier authority', 'authority', current.value.authority, 'QuakeML identifiers read smi:AUTHORITY/\u2026'),
    el('label', { className: 'setting' }, el('span', {}, 'Scan settings'),
      el('select', { name: 'scanPreset' }, ...SCAN_PRESET_SETTINGS.map((v) => el('option', { value: v, selected: v === current.value.scanPreset }, SCAN_PRESET_LABELS[v]))),
      el('small', { className: 'muted' }, 'for \u201cScan the night\u201d; automatic takes near-source settings when the sites are 3 km apart or less in the median')),
    el('div', { className: 'buttons' }, el('button', { value: 'save' }, 'Save'), el('button', { value: 'cancel' }, 'Cancel')));
  const dialog = el('dialog', { id: 'settings' }, form);
  document.body.append(dialog);
  dialog.addEventListener('close', async () => {
    if (dialog.returnValue === 'save') {
      const data = new FormData(form);
      const r = await host.call('settings.set', {
        analyst: String(data.get('analyst')), agency: String(data.get('agency')), authority: String(data.get('authority')),
        scanPreset: String(data.get('scanPreset')) as ScanPresetSetting,
      });
      statusText.textContent = r.ok ? 'settings saved' : `settings not saved: ${r.message}`;
    }
    dialog.remove();
  });
  dialog.showModal();
}

async function openFolder(root: string): Promise<void> {
  const ds = await host.call('dataset.open', { root });
  if (!ds.ok) {
    mainArea.replaceChildren(el('div', { className: 'card' }, el('p', { className: 'error' }, `Could not open ${root}: ${ds.message}`)));
    return;
  }
  showDataset(ds.value);
}

async function showDataset(ds: Dataset): Promise<void> {
  desk?.close();
  const card = el('div', { className: 'card' }, el('h2', {}, ds.root));
  const bar = el('div', { className: 'progress' }, el('div'));
  const msg = el('p', {}, `Reading ${ds.files.filter((f) => f.kind === 'miniseed').length} miniSEED files\u2026`);
  const cancel = el('button', {}, 'Cancel');
  card.append(msg, bar, cancel);
  mainArea.replaceChildren(card);
  const autoScan = new URLSearchParams(location.search).get('scan') !== 'off';
  const opening = new Desk(host, ds, (text) => { statusText.textContent = text; }, autoScan);
  desk = opening;
  cancel.addEventListener('click', () => opening.cancelOpen());
  try {
    await opening.open((fraction, note) => {
      (bar.firstChild as HTMLDivElement).style.width = `${Math.round(fraction * 100)}%`;
      msg.textContent = `Reading ${note}`;
    });
  } catch (e) {
    if (e instanceof CancelledError) {
      desk = null;
      mainArea.replaceChildren(el('div', { className: 'card' }, el('p', {}, `Stopped reading ${ds.root}. Open a folder with the field above.`)));
      return;
    }
    throw e;
  }
  mainArea.replaceChildren(desk.root);
  mainArea.classList.add('with-desk');
}

const wanted = new URLSearchParams(location.search).get('dataset');
(wanted ? openFolder(wanted) : openDemo()).catch((e: unknown) => {
  mainArea.replaceChildren(el('p', { className: 'error' }, String(e instanceof Error ? e.message : e)));
});
