-- Economics get two energy bases (docs/calc-json.md): heat lost by hot lines is bought on
-- the heating basis {price_per_kwh, efficiency, hours_per_year, co2_kg_per_kwh}, heat
-- gained by cold lines is removed on the cooling basis {price_per_kwh, cop, hours_per_year,
-- co2_kg_per_kwh}. A stored block had one price for every line: it goes to both bases
-- (with its hours and CO2 factor), the efficiency to heating and the COP to cooling, so
-- nothing entered is lost. Check the cooling price of migrated projects: where only an
-- efficiency was given it was a fuel price. A block without a price priced nothing and is
-- removed. Project settings and any economics a line carries itself are migrated.
CREATE FUNCTION economics_two_bases(e jsonb) RETURNS jsonb LANGUAGE sql IMMUTABLE AS $$
SELECT CASE
    WHEN e IS NULL OR jsonb_typeof(e) <> 'object' OR e ? 'heating' OR e ? 'cooling' THEN e
    WHEN NOT e ? 'energy_price_per_kwh' OR jsonb_typeof(e->'energy_price_per_kwh') = 'null' THEN NULL
    ELSE (e - ARRAY['energy_price_per_kwh', 'efficiency', 'cop', 'hours_per_year', 'co2_kg_per_kwh'])
        || jsonb_build_object(
            'heating', jsonb_strip_nulls(jsonb_build_object('price_per_kwh', e->'energy_price_per_kwh',
                'efficiency', e->'efficiency', 'hours_per_year', e->'hours_per_year', 'co2_kg_per_kwh', e->'co2_kg_per_kwh')),
            'cooling', jsonb_strip_nulls(jsonb_build_object('price_per_kwh', e->'energy_price_per_kwh',
                'cop', e->'cop', 'hours_per_year', e->'hours_per_year', 'co2_kg_per_kwh', e->'co2_kg_per_kwh')))
END
$$;

UPDATE projects SET settings = CASE
        WHEN economics_two_bases(settings->'economics') IS NULL THEN settings - 'economics'
        ELSE jsonb_set(settings, '{economics}', economics_two_bases(settings->'economics')) END
    WHERE settings ? 'economics' AND economics_two_bases(settings->'economics') IS DISTINCT FROM settings->'economics';

UPDATE lines SET input = CASE
        WHEN economics_two_bases(input->'economics') IS NULL THEN input - 'economics'
        ELSE jsonb_set(input, '{economics}', economics_two_bases(input->'economics')) END
    WHERE input ? 'economics' AND economics_two_bases(input->'economics') IS DISTINCT FROM input->'economics';

DROP FUNCTION economics_two_bases(jsonb);
