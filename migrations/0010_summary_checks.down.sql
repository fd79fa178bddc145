ALTER TABLE lines DROP COLUMN result_summary;

CREATE OR REPLACE FUNCTION line_result_summary(r jsonb) RETURNS jsonb LANGUAGE sql IMMUTABLE PARALLEL SAFE AS $$
SELECT CASE WHEN r IS NULL THEN NULL ELSE jsonb_build_object(
    'errors', r->'errors',
    'output', CASE WHEN jsonb_typeof(r->'output') = 'object' THEN jsonb_build_object(
        'operating_temp_c', r#>'{output,operating_temp_c}',
        'heat_flow_w_per_m', r#>'{output,heat_flow_w_per_m}',
        'heat_flux_w_m2', r#>'{output,heat_flux_w_m2}',
        'heat_flow_w', r#>'{output,heat_flow_w}',
        'surface_temp_c', r#>'{output,surface_temp_c}',
        'faces', r#>'{output,faces}',
        'condensation_margin_k', r#>'{output,condensation_margin_k}',
        'energy_code', CASE WHEN jsonb_typeof(r#>'{output,energy_code}') = 'object' THEN jsonb_build_object(
            'required', r#>'{output,energy_code,required}', 'pass', r#>'{output,energy_code,pass}') END,
        'sizing', jsonb_build_object(
            'personnel_protection_mm', r#>'{output,sizing,personnel_protection_mm}',
            'condensation_mm', r#>'{output,sizing,condensation_mm}',
            'max_heat_flow_mm', r#>'{output,sizing,max_heat_flow_mm}',
            'max_temp_change_mm', r#>'{output,sizing,max_temp_change_mm}',
            'freeze_mm', r#>'{output,sizing,freeze_mm}',
            'energy_code_mm', r#>'{output,sizing,energy_code_mm}',
            'economic_mm', r#>'{output,sizing,economic_mm}',
            'governing', r#>'{output,sizing,governing}',
            'governing_thickness_mm', r#>'{output,sizing,governing_thickness_mm}',
            'unmet', r#>'{output,sizing,unmet}')) END) END
$$;

ALTER TABLE lines ADD COLUMN result_summary jsonb GENERATED ALWAYS AS (line_result_summary(result)) STORED;
