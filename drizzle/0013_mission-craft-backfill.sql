-- A history kept before the flag existed: its first recorded craft is the mission's own.
UPDATE "spacecraft" SET "is_mission_craft" = true
  WHERE "id" = (SELECT "id" FROM "spacecraft" ORDER BY "created_at", "id" LIMIT 1)
    AND NOT EXISTS (SELECT 1 FROM "spacecraft" WHERE "is_mission_craft");
