// /calc/<id>/geometry.xyz: download of the current version.
import type { APIRoute } from "astro";
import type { FieldbookRecord } from "../../../archive/record.ts";
import { currentPaths, downloadResponse } from "../../../site/downloads.ts";
export const getStaticPaths = currentPaths;
export const GET: APIRoute = ({ props }) => downloadResponse((props as { record: FieldbookRecord }).record, "geometry.xyz");
