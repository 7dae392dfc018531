// /calc/<id>/v/<version>/geometry.xyz: download of one version.
import type { APIRoute } from "astro";
import type { FieldbookRecord } from "../../../../../archive/record.ts";
import { downloadResponse, versionPaths } from "../../../../../site/downloads.ts";
export const getStaticPaths = versionPaths;
export const GET: APIRoute = ({ props }) => downloadResponse((props as { record: FieldbookRecord }).record, "geometry.xyz");
