"use client";

import L from "leaflet";
import Link from "next/link";
import { useTranslations } from "next-intl";
import { useCallback, useEffect, useId, useMemo, useRef, useState } from "react";
import { MapContainer, useMap } from "react-leaflet";
import Supercluster, { type PointFeature } from "supercluster";
import { type Bounds, clampBounds } from "@/lib/geo/bounds";
import {
  type DigFeature,
  type DigProperties,
  type FieldFeature,
  indexBand,
  isDigFeature,
  isFieldFeature,
  MAX_MAP_PINS,
  STAGES,
} from "@/lib/geo/map-features";
import { MapBase, type TileProps } from "./map-base";
import { fetchMap, type MapFilterValues, mapQuery, mapUrl, NO_FILTERS, WORLD } from "./map-data";
import { MapLegend } from "./map-legend";
import { clusterSvg, escapeHtml, PIN_SIZE, pinSvg } from "./pin-icons";

export interface DigMapProps extends TileProps {
  /** Only this account's fields and digs (no account filter shown). */
  accountId?: string;
  /** Only this field's boundary and digs. */
  fieldId?: string;
  /** CSS height of the map; default 32rem. */
  height?: string;
  showFilters?: boolean;
  /** [[south, west], [north, east]]; without it the map fits what the first request returns. */
  initialBounds?: [[number, number], [number, number]];
  /** Accounts the actor may see, for the account filter (shown when there are two or more). */
  accounts?: { id: string; name: string }[];
}

type Filters = MapFilterValues;
const FETCH_DEBOUNCE_MS = 250;
const LIST_LIMIT = 50;

interface Loaded {
  pins: DigFeature[];
  fields: FieldFeature[];
  truncated: boolean;
}

export interface ViewSummary {
  shown: number;
  flagged: number;
  /** The single pins in view, up to LIST_LIMIT, for the text list. */
  listed: DigProperties[];
}

export function DigMap({
  accountId,
  fieldId,
  height = "32rem",
  showFilters = false,
  initialBounds,
  accounts,
  tileUrl,
  tileAttribution,
}: DigMapProps) {
  const t = useTranslations("map");
  const [filters, setFilters] = useState<Filters>(NO_FILTERS);
  const [status, setStatus] = useState<"loading" | "ready" | "error">("loading");
  const [loaded, setLoaded] = useState<Loaded | null>(null);
  const [view, setView] = useState<ViewSummary>({ shown: 0, flagged: 0, listed: [] });
  const [retry, setRetry] = useState(0);
  // Hybrids seen so far, offered as suggestions (kept when a filter narrows the pins).
  const [hybrids, setHybrids] = useState<string[]>([]);
  useEffect(() => {
    const seen = (loaded?.pins ?? []).map((p) => p.properties.hybrid).filter((h): h is string => Boolean(h));
    setHybrids((old) => {
      const next = [...new Set([...old, ...seen])].sort();
      return next.length === old.length ? old : next;
    });
  }, [loaded]);
  const rangeError = filters.from !== "" && filters.to !== "" && filters.from > filters.to;
  const query = useMemo(
    () => mapQuery({ accountId, fieldId }, filters, rangeError),
    [accountId, fieldId, filters, rangeError],
  );

  return (
    <div className="space-y-4">
      {showFilters ? (
        <MapFilters
          filters={filters}
          onChange={setFilters}
          hybrids={hybrids}
          accounts={accountId ? undefined : accounts}
          rangeError={rangeError}
        />
      ) : null}
      <div className="grid gap-4 lg:grid-cols-[minmax(0,1fr)_18rem]">
        <div className="min-w-0 space-y-2">
          <div className="relative overflow-hidden rounded-card border border-soil-300" style={{ height }}>
            <MapContainer
              className="trench-map h-full w-full"
              {...(initialBounds ? { bounds: initialBounds } : { center: [20, 0], zoom: 2 })}
              minZoom={2}
              maxZoom={19}
              worldCopyJump={false}
              preferCanvas
            >
              <MapBase tileUrl={tileUrl} tileAttribution={tileAttribution} label={t("mapLabel")} />
              <DigLayers
                query={query}
                fitKey={accountId ?? filters.accountId}
                fitFirst={!initialBounds}
                retry={retry}
                onStatus={setStatus}
                onLoaded={setLoaded}
                onView={setView}
              />
            </MapContainer>
            {status === "loading" ? (
              <p className="pointer-events-none absolute top-2 right-2 z-[1000] rounded bg-white/95 px-3 py-1 text-sm shadow">
                {t("loading")}
              </p>
            ) : null}
          </div>
          {status === "error" ? (
            <div role="alert" className="notice-error flex flex-wrap items-center gap-3">
              <span>{t("loadError")}</span>
              <button type="button" className="btn-secondary" onClick={() => setRetry((n) => n + 1)}>
                {t("retry")}
              </button>
            </div>
          ) : null}
          <p aria-live="polite" className="font-semibold" data-testid="map-summary">
            {loaded ? t("summary", { shown: view.shown, flagged: view.flagged }) : t("loading")}
          </p>
          {loaded?.truncated ? (
            <p className="notice-caution">{t("truncated", { max: MAX_MAP_PINS })}</p>
          ) : null}
          {loaded && status === "ready" && view.shown === 0 ? (
            <p className="notice-caution">{t("empty")}</p>
          ) : null}
          {view.listed.length > 0 ? <DigList view={view} /> : null}
        </div>
        <MapLegend />
      </div>
    </div>
  );
}

function DigList({ view }: { view: ViewSummary }) {
  const t = useTranslations("map");
  return (
    <details className="rounded-card border border-soil-200 bg-white p-3">
      <summary className="cursor-pointer font-semibold">{t("list.heading", { count: view.shown })}</summary>
      <ul className="mt-2 space-y-1">
        {view.listed.map((p) => (
          <li key={p.id}>
            <Link className="underline" href={`/digs/${p.id}`}>
              {pinLabel(t, p)}
            </Link>
          </li>
        ))}
      </ul>
      {view.shown > view.listed.length ? (
        <p className="mt-2 text-sm text-soil-700">
          {t("list.more", { count: view.shown - view.listed.length })}
        </p>
      ) : null}
    </details>
  );
}

type T = ReturnType<typeof useTranslations<"map">>;

function pinLabel(t: T, p: DigProperties): string {
  const band = indexBand(p.rootIndex);
  return t("pin.label", {
    field: p.fieldName,
    date: p.dugAt.slice(0, 10),
    stage: p.leafStage ?? t("pin.unknown"),
    band: t(`band.${band}`),
    index: p.rootIndex ?? "",
    flagged: p.flagged ? "yes" : "no",
  });
}

function popupHtml(t: T, p: DigProperties): string {
  const row = (label: string, value: string) =>
    `<div class="flex gap-2"><dt class="font-semibold">${escapeHtml(label)}:</dt><dd>${escapeHtml(value)}</dd></div>`;
  const band = indexBand(p.rootIndex);
  const flags =
    p.flags.count === 0
      ? t("pin.noFlags")
      : t("pin.flagsValue", { count: p.flags.count, severity: t(`severity.${p.flags.severity ?? "info"}`) });
  return `<div class="space-y-1 text-sm"><p class="text-base font-semibold">${escapeHtml(p.fieldName)}</p>${
    p.flagged ? `<p class="font-semibold">! ${escapeHtml(t("pin.flaggedNote"))}</p>` : ""
  }<dl>${[
    row(t("pin.account"), p.accountName),
    row(t("pin.dugOn"), p.dugAt.slice(0, 10)),
    row(t("pin.hybrid"), p.hybrid ?? t("pin.unknown")),
    row(t("pin.stage"), p.leafStage ?? t("pin.unknown")),
    row(
      t("pin.rootIndex"),
      p.rootIndex === null ? t("band.unscored") : `${p.rootIndex} (${t(`band.${band}`)})`,
    ),
    row(t("pin.flags"), flags),
    ...(p.caseStatus ? [row(t("pin.case"), t(`caseStatus.${p.caseStatus}`))] : []),
  ].join("")}</dl><p><a class="font-semibold underline" href="/digs/${encodeURIComponent(p.id)}">${escapeHtml(
    t("pin.open"),
  )}</a></p></div>`;
}

function fieldPopupHtml(t: T, f: FieldFeature["properties"]): string {
  return `<div class="space-y-1 text-sm"><p class="text-base font-semibold">${escapeHtml(f.name)}</p><p>${escapeHtml(
    f.accountName,
  )}</p>${
    f.areaAcres === null ? "" : `<p>${escapeHtml(t("fieldPopup.area", { acres: f.areaAcres }))}</p>`
  }<p><a class="font-semibold underline" href="/fields/${encodeURIComponent(f.id)}">${escapeHtml(
    t("fieldPopup.open"),
  )}</a></p></div>`;
}

const pinIcons = new Map<string, L.DivIcon>();
function pinIcon(p: DigProperties): L.DivIcon {
  const band = indexBand(p.rootIndex);
  const key = `${band}-${p.flagged}`;
  let icon = pinIcons.get(key);
  if (!icon) {
    icon = L.divIcon({
      html: pinSvg(band, p.flagged),
      className: `trench-pin trench-pin-${band}${p.flagged ? " trench-pin-flagged" : ""}`,
      iconSize: [PIN_SIZE, PIN_SIZE],
      iconAnchor: [PIN_SIZE / 2, PIN_SIZE / 2],
      popupAnchor: [0, -PIN_SIZE / 2],
    });
    pinIcons.set(key, icon);
  }
  return icon;
}

const clusterIcons = new Map<string, L.DivIcon>();
function clusterIcon(count: number, flagged: number): L.DivIcon {
  const key = `${count}-${flagged > 0}`;
  let icon = clusterIcons.get(key);
  if (!icon) {
    const { html, size } = clusterSvg(count, flagged);
    icon = L.divIcon({
      html,
      className: `trench-cluster${flagged > 0 ? " trench-cluster-flagged" : ""}`,
      iconSize: [size, size],
      iconAnchor: [size / 2, size / 2],
    });
    clusterIcons.set(key, icon);
  }
  return icon;
}

interface ClusterProps {
  flagged: number;
}
type PointProps = DigProperties;

function boundsOf(map: L.Map, pad = 0): Bounds {
  const b = pad > 0 ? map.getBounds().pad(pad) : map.getBounds();
  return clampBounds({ west: b.getWest(), south: b.getSouth(), east: b.getEast(), north: b.getNorth() });
}

const contains = (outer: Bounds, inner: Bounds) =>
  outer.west <= inner.west &&
  outer.south <= inner.south &&
  outer.east >= inner.east &&
  outer.north >= inner.north;

// Everything drawn inside the Leaflet map: the field shapes, the clustered pins and the requests.
function DigLayers({
  query,
  fitKey,
  fitFirst,
  retry,
  onStatus,
  onLoaded,
  onView,
}: {
  query: string;
  /** When it changes (another account chosen) the map fits what the next request returns. */
  fitKey: string;
  fitFirst: boolean;
  retry: number;
  onStatus: (s: "loading" | "ready" | "error") => void;
  onLoaded: (l: Loaded) => void;
  onView: (v: ViewSummary) => void;
}) {
  const map = useMap();
  const t = useTranslations("map");
  const tRef = useRef(t);
  tRef.current = t;
  const layers = useRef<{ fields: L.GeoJSON; pins: L.LayerGroup } | null>(null);
  const index = useRef<Supercluster<PointProps, ClusterProps> | null>(null);
  const pins = useRef<DigFeature[]>([]);
  const drawn = useRef(new Map<string, L.Marker>());
  const loadedFor = useRef<{ query: string; bounds: Bounds; truncated: boolean } | null>(null);
  const abort = useRef<AbortController | null>(null);
  const timer = useRef<ReturnType<typeof setTimeout> | null>(null);
  const firstFit = useRef(fitFirst);
  const fitKeyRef = useRef(fitKey);
  const queryRef = useRef(query);
  queryRef.current = query;

  const renderPins = useCallback(() => {
    const group = layers.current?.pins;
    const idx = index.current;
    if (!group || !idx) return;
    const view = boundsOf(map);
    const zoom = Math.round(map.getZoom());
    const items = idx.getClusters([view.west, view.south, view.east, view.north], zoom);
    const tr = tRef.current;
    // Markers still in view stay (an open popup survives the pan it causes); the rest go.
    const next = new Map<string, L.Marker>();
    let shown = 0;
    let flagged = 0;
    const listed: DigProperties[] = [];
    for (const item of items) {
      const [lon, lat] = item.geometry.coordinates as [number, number];
      const props = item.properties as
        | (ClusterProps & { cluster: true; cluster_id: number; point_count: number })
        | PointProps;
      if ("cluster" in props && props.cluster) {
        const { cluster_id: id, point_count: count, flagged: f } = props;
        shown += count;
        flagged += f;
        const kept = drawn.current.get(`c${id}`);
        if (kept) {
          next.set(`c${id}`, kept);
          continue;
        }
        const label = tr("pin.cluster", { count, flagged: f });
        const marker = L.marker([lat, lon], { icon: clusterIcon(count, f), title: label, riseOnHover: true });
        const zoomIn = () =>
          map.setView([lat, lon], Math.min(idx.getClusterExpansionZoom(id), map.getMaxZoom()));
        marker.on("click", zoomIn);
        marker.on("keypress", (e: L.LeafletKeyboardEvent) => {
          if (e.originalEvent.key === "Enter" || e.originalEvent.key === " ") zoomIn();
        });
        group.addLayer(marker);
        marker.getElement()?.setAttribute("aria-label", label);
        next.set(`c${id}`, marker);
      } else {
        const p = props as PointProps;
        shown += 1;
        if (p.flagged) flagged += 1;
        const kept = drawn.current.get(`p${p.id}`);
        if (kept) {
          next.set(`p${p.id}`, kept);
          continue;
        }
        const label = pinLabel(tr, p);
        const marker = L.marker([lat, lon], { icon: pinIcon(p), title: label, riseOnHover: true });
        marker.bindPopup(() => popupHtml(tRef.current, p), { maxWidth: 280 });
        group.addLayer(marker);
        marker.getElement()?.setAttribute("aria-label", label);
        next.set(`p${p.id}`, marker);
      }
    }
    for (const [key, marker] of drawn.current) if (!next.has(key)) group.removeLayer(marker);
    drawn.current = next;
    // The text list names the digs in view whether they are drawn alone or inside a cluster.
    for (const d of pins.current) {
      if (listed.length >= LIST_LIMIT) break;
      const [lon, lat] = d.geometry.coordinates;
      if (lon >= view.west && lon <= view.east && lat >= view.south && lat <= view.north)
        listed.push(d.properties);
    }
    onView({ shown, flagged, listed });
  }, [map, onView]);

  const load = useCallback(
    async (bounds: Bounds) => {
      abort.current?.abort();
      const ac = new AbortController();
      abort.current = ac;
      const q = queryRef.current;
      onStatus("loading");
      try {
        const data = await fetchMap(mapUrl(bounds, q), ac.signal);
        if (ac.signal.aborted) return;
        const fields = data.features.filter(isFieldFeature);
        const digs = data.features.filter(isDigFeature);
        loadedFor.current = { query: q, bounds, truncated: data.truncated };
        pins.current = digs;
        layers.current?.fields.clearLayers();
        layers.current?.fields.addData({
          type: "FeatureCollection",
          features: fields,
        } as GeoJSON.FeatureCollection);
        const idx = new Supercluster<PointProps, ClusterProps>({
          // Radius in screen pixels: supercluster measures it against the tile extent, Leaflet's 256.
          extent: 256,
          radius: 60,
          maxZoom: 17,
          map: (p) => ({ flagged: p.flagged ? 1 : 0 }),
          reduce: (acc, p) => {
            acc.flagged += p.flagged;
          },
        });
        idx.load(digs as unknown as PointFeature<PointProps>[]);
        index.current = idx;
        // Cluster ids belong to one index, and pins may have changed: redraw all but an open popup's.
        for (const [key, marker] of drawn.current) {
          if (marker.isPopupOpen()) continue;
          layers.current?.pins.removeLayer(marker);
          drawn.current.delete(key);
        }
        onLoaded({ pins: digs, fields, truncated: data.truncated });
        onStatus("ready");
        if (firstFit.current) {
          firstFit.current = false;
          const all = L.latLngBounds([]);
          for (const d of digs) all.extend([d.geometry.coordinates[1], d.geometry.coordinates[0]]);
          for (const f of fields)
            for (const [lon, lat] of f.geometry.coordinates[0] ?? []) all.extend([lat, lon]);
          if (all.isValid()) map.fitBounds(all, { padding: [24, 24], maxZoom: 16, animate: false });
        }
        renderPins();
      } catch (err) {
        if (ac.signal.aborted || (err instanceof DOMException && err.name === "AbortError")) return;
        onStatus("error");
      }
    },
    [map, onLoaded, onStatus, renderPins],
  );

  // Layers once per map.
  useEffect(() => {
    const fields = L.geoJSON(undefined, {
      style: { color: "#5a4529", weight: 2, fillColor: "#c9b493", fillOpacity: 0.18 },
      onEachFeature: (feature, layer) => {
        const f = feature as unknown as FieldFeature;
        layer.bindPopup(() => fieldPopupHtml(tRef.current, f.properties), { maxWidth: 260 });
      },
    }).addTo(map);
    const pinGroup = L.layerGroup().addTo(map);
    layers.current = { fields, pins: pinGroup };
    return () => {
      fields.remove();
      pinGroup.remove();
      drawn.current.clear();
      layers.current = null;
      abort.current?.abort();
    };
  }, [map]);

  // A new query (filters, debounced while typing) or a retry: ask again; for the whole world when the
  // map is to fit what it gets (the first time without initial bounds, and on another account).
  // biome-ignore lint/correctness/useExhaustiveDependencies: query and retry are the triggers
  useEffect(() => {
    if (fitKeyRef.current !== fitKey) {
      fitKeyRef.current = fitKey;
      firstFit.current = true;
      loadedFor.current = null;
    }
    if (firstFit.current && !loadedFor.current) {
      void load(WORLD);
      return;
    }
    if (timer.current) clearTimeout(timer.current);
    timer.current = setTimeout(() => void load(boundsOf(map, 0.5)), FETCH_DEBOUNCE_MS);
  }, [query, retry, load, map, fitKey]);

  // Moving the map redraws the clusters at once and asks again only when the view left what was
  // loaded (or the last answer was capped), debounced, the previous request aborted.
  useEffect(() => {
    const onMove = () => {
      renderPins();
      const view = boundsOf(map);
      const have = loadedFor.current;
      if (have && have.query === queryRef.current && !have.truncated && contains(have.bounds, view)) return;
      if (timer.current) clearTimeout(timer.current);
      timer.current = setTimeout(() => void load(boundsOf(map, 0.5)), FETCH_DEBOUNCE_MS);
    };
    map.on("moveend", onMove);
    return () => {
      map.off("moveend", onMove);
      if (timer.current) clearTimeout(timer.current);
    };
  }, [map, load, renderPins]);

  return null;
}

function MapFilters({
  filters,
  onChange,
  hybrids,
  accounts,
  rangeError,
}: {
  filters: Filters;
  onChange: (f: Filters) => void;
  hybrids: string[];
  accounts?: { id: string; name: string }[];
  rangeError: boolean;
}) {
  const t = useTranslations("map.filters");
  const id = useId();
  const set = <K extends keyof Filters>(k: K, v: Filters[K]) => onChange({ ...filters, [k]: v });
  return (
    <fieldset className="card grid grid-cols-2 gap-3 lg:grid-cols-3">
      <legend className="px-1 font-semibold">{t("legend")}</legend>
      <div>
        <label className="field-label" htmlFor={`${id}-from`}>
          {t("from")}
        </label>
        <input
          id={`${id}-from`}
          type="date"
          className="field-input"
          value={filters.from}
          onChange={(e) => set("from", e.target.value)}
        />
      </div>
      <div>
        <label className="field-label" htmlFor={`${id}-to`}>
          {t("to")}
        </label>
        <input
          id={`${id}-to`}
          type="date"
          className="field-input"
          value={filters.to}
          aria-invalid={rangeError || undefined}
          aria-describedby={rangeError ? `${id}-to-error` : undefined}
          onChange={(e) => set("to", e.target.value)}
        />
        {rangeError ? (
          <p id={`${id}-to-error`} className="field-error">
            {t("rangeError")}
          </p>
        ) : null}
      </div>
      <div>
        <label className="field-label" htmlFor={`${id}-hybrid`}>
          {t("hybrid")}
        </label>
        <input
          id={`${id}-hybrid`}
          className="field-input"
          list={`${id}-hybrids`}
          value={filters.hybrid}
          autoComplete="off"
          onChange={(e) => set("hybrid", e.target.value)}
        />
        <datalist id={`${id}-hybrids`}>
          {hybrids.map((h) => (
            <option key={h} value={h} />
          ))}
        </datalist>
      </div>
      <div>
        <label className="field-label" htmlFor={`${id}-stage`}>
          {t("stage")}
        </label>
        <select
          id={`${id}-stage`}
          className="field-input"
          value={filters.stage}
          onChange={(e) => set("stage", e.target.value)}
        >
          <option value="">{t("anyStage")}</option>
          {STAGES.map((s) => (
            <option key={s} value={s}>
              {s}
            </option>
          ))}
        </select>
      </div>
      {accounts && accounts.length > 1 ? (
        <div>
          <label className="field-label" htmlFor={`${id}-account`}>
            {t("account")}
          </label>
          <select
            id={`${id}-account`}
            className="field-input"
            value={filters.accountId}
            onChange={(e) => set("accountId", e.target.value)}
          >
            <option value="">{t("anyAccount")}</option>
            {accounts.map((a) => (
              <option key={a.id} value={a.id}>
                {a.name}
              </option>
            ))}
          </select>
        </div>
      ) : null}
      <div className="col-span-2 flex flex-wrap items-end gap-3 lg:col-span-1">
        <label className="flex min-h-tap items-center gap-2 font-semibold">
          <input
            type="checkbox"
            className="size-6"
            checked={filters.flagged}
            onChange={(e) => set("flagged", e.target.checked)}
          />
          {t("flagged")}
        </label>
        <button type="button" className="btn-secondary" onClick={() => onChange(NO_FILTERS)}>
          {t("clear")}
        </button>
      </div>
    </fieldset>
  );
}
