CREATE TABLE "lexicon_entries" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"crew_id" uuid NOT NULL,
	"word" text NOT NULL,
	"phones" text NOT NULL,
	"sounds_like" text,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "lexicon_entries_crew_word_key" UNIQUE("crew_id","word"),
	CONSTRAINT "lexicon_entries_word_check" CHECK ("lexicon_entries"."word" ~ '^''?[a-z]+(''[a-z]+)*''?$' AND length("lexicon_entries"."word") <= 40),
	CONSTRAINT "lexicon_entries_phones_check" CHECK ("lexicon_entries"."phones" ~ '^((AA|AE|AH|AO|AW|AY|EH|ER|EY|IH|IY|OW|OY|UH|UW)[012]|B|CH|D|DH|F|G|HH|JH|K|L|M|N|NG|P|R|S|SH|T|TH|V|W|Y|Z|ZH)( ((AA|AE|AH|AO|AW|AY|EH|ER|EY|IH|IY|OW|OY|UH|UW)[012]|B|CH|D|DH|F|G|HH|JH|K|L|M|N|NG|P|R|S|SH|T|TH|V|W|Y|Z|ZH))*$')
);
--> statement-breakpoint
ALTER TABLE "lexicon_entries" ADD CONSTRAINT "lexicon_entries_crew_id_crews_id_fk" FOREIGN KEY ("crew_id") REFERENCES "public"."crews"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "lexicon_entries" ADD CONSTRAINT "lexicon_entries_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "lexicon_entries_crew_idx" ON "lexicon_entries" USING btree ("crew_id");