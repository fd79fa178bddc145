package analysis

import "lagwright/catalog"

// Resolver finds insulation materials and jackets by slug. The `calc` command resolves
// from the compiled-in catalog; the app resolves from the database, which holds the
// catalog rows and custom ones, so a built-in slug gives the same answer both ways.
// Pipe sizes and pipe materials always come from the catalog.
type Resolver interface {
	Material(slug string) (catalog.Material, bool)
	Jacket(slug string) (catalog.Jacket, bool)
	// CodeTable finds an energy-code table by id (criteria.energy_code): the built-in
	// ones, and in the app the users' own.
	CodeTable(id string) (catalog.CodeTable, bool)
}

// CatalogResolver resolves from the compiled-in catalog only.
type CatalogResolver struct{}

// Material implements Resolver.
func (CatalogResolver) Material(slug string) (catalog.Material, bool) {
	return catalog.MaterialBySlug(slug)
}

// Jacket implements Resolver.
func (CatalogResolver) Jacket(slug string) (catalog.Jacket, bool) {
	return catalog.JacketBySlug(slug)
}

// CodeTable implements Resolver.
func (CatalogResolver) CodeTable(id string) (catalog.CodeTable, bool) {
	return catalog.CodeTableByID(id)
}
