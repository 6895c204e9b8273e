// Where Tiltwright ships: the countries a school may be in, and for each its region codes
// (for the United States the USPS codes of the states, DC and the inhabited territories).
export const US_REGIONS = [
  'AL', 'AK', 'AZ', 'AR', 'CA', 'CO', 'CT', 'DE', 'DC', 'FL', 'GA', 'HI', 'ID', 'IL', 'IN', 'IA', 'KS', 'KY', 'LA',
  'ME', 'MD', 'MA', 'MI', 'MN', 'MS', 'MO', 'MT', 'NE', 'NV', 'NH', 'NJ', 'NM', 'NY', 'NC', 'ND', 'OH', 'OK', 'OR',
  'PA', 'RI', 'SC', 'SD', 'TN', 'TX', 'UT', 'VT', 'VA', 'WA', 'WV', 'WI', 'WY', 'AS', 'GU', 'MP', 'PR', 'VI',
] as const

export const REGIONS_BY_COUNTRY: Record<string, readonly string[]> = {
  US: US_REGIONS,
}

export const COUNTRY_CODES = Object.keys(REGIONS_BY_COUNTRY)
