-- Back to one energy basis: the heating basis where given (else the cooling one) gives the
-- price, hours and CO2 factor; the efficiency and COP are kept. The currency goes.
CREATE FUNCTION economics_one_basis(e jsonb) RETURNS jsonb LANGUAGE sql IMMUTABLE AS $$
SELECT CASE
    WHEN e IS NULL OR jsonb_typeof(e) <> 'object' OR NOT (e ? 'heating' OR e ? 'cooling') THEN e
    ELSE (e - ARRAY['heating', 'cooling', 'currency']) || jsonb_strip_nulls(jsonb_build_object(
        'energy_price_per_kwh', COALESCE(e#>'{heating,price_per_kwh}', e#>'{cooling,price_per_kwh}'),
        'efficiency', e#>'{heating,efficiency}', 'cop', e#>'{cooling,cop}',
        'hours_per_year', COALESCE(e#>'{heating,hours_per_year}', e#>'{cooling,hours_per_year}'),
        'co2_kg_per_kwh', COALESCE(e#>'{heating,co2_kg_per_kwh}', e#>'{cooling,co2_kg_per_kwh}')))
END
$$;

UPDATE projects SET settings = jsonb_set(settings, '{economics}', economics_one_basis(settings->'economics'))
    WHERE settings ? 'economics' AND jsonb_typeof(settings->'economics') = 'object';
UPDATE lines SET input = jsonb_set(input, '{economics}', economics_one_basis(input->'economics'))
    WHERE input ? 'economics' AND jsonb_typeof(input->'economics') = 'object';

DROP FUNCTION economics_one_basis(jsonb);
