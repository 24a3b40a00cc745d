import type { Metadata } from "next";
import { publicPageMetadata } from "@/lib/page-metadata";
import { AnalyseWorkbench } from "./workbench";

export async function generateMetadata(): Promise<Metadata> {
  return publicPageMetadata({
    title: "Fit your own data",
    description:
      "Paste a table of rate constants against temperature and get the Arrhenius, modified Arrhenius and Eyring fits with outliers and curvature flagged.",
    path: "/analyse",
  });
}

export default function AnalysePage() {
  return (
    <div className="space-y-6">
      <header className="space-y-2">
        <h1 className="text-3xl font-semibold">Fit your own data</h1>
        <p className="max-w-3xl text-muted">
          Paste temperatures and rate constants to see them fitted exactly as every Arrhenia dataset is: Arrhenius, modified Arrhenius and
          Eyring, with outliers, curvature, range and scatter checked. Nothing you paste is stored. Scripts can do the same through{" "}
          <code>POST /api/v1/analyses</code>.
        </p>
      </header>
      <AnalyseWorkbench />
    </div>
  );
}
