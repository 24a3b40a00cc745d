CREATE TABLE "species_drawings" (
	"smiles" text NOT NULL,
	"width" integer NOT NULL,
	"height" integer NOT NULL,
	"drawer" text NOT NULL,
	"svg" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "species_drawings_smiles_width_height_drawer_pk" PRIMARY KEY("smiles","width","height","drawer")
);
